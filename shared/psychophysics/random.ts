/**
 * Seeded pseudo-random numbers for the bootstrap (never Math.random): xoshiro128** (Blackman & Vigna 2018)
 * with its state filled by splitmix32 from one 32-bit seed. Same seed, same stream, on every platform.
 */
export type Random = () => number;

function splitmix32(seed: number): () => number {
  let a = seed | 0;
  return () => {
    a = (a + 0x9e3779b9) | 0;
    let t = a ^ (a >>> 16);
    t = Math.imul(t, 0x21f0aaad);
    t ^= t >>> 15;
    t = Math.imul(t, 0x735a2d97);
    t ^= t >>> 15;
    return t >>> 0;
  };
}

/** Uniform numbers in [0, 1) with 32 random bits each. `seed` is taken as an unsigned 32-bit integer. */
export function createRandom(seed: number): Random {
  const mix = splitmix32(Math.floor(seed) >>> 0);
  let s0 = mix() | 0;
  let s1 = mix() | 0;
  let s2 = mix() | 0;
  let s3 = mix() | 0;
  if ((s0 | s1 | s2 | s3) === 0) s0 = 1;
  return () => {
    const m = Math.imul(s1, 5);
    const r = Math.imul((m << 7) | (m >>> 25), 9);
    const t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= t;
    s3 = (s3 << 11) | (s3 >>> 21);
    return (r >>> 0) / 4294967296;
  };
}

/**
 * One Binomial(n, p) draw, exact: inversion of the cdf from 0 (Kachitvichyanukul & Schmeiser 1988, "BINV")
 * on min(p, 1 − p) while n·min(p, 1 − p) < 500 (about that many steps), otherwise a sum of n Bernoulli draws.
 */
export function binomialDraw(n: number, p: number, rnd: Random): number {
  if (!(p > 0)) return 0;
  if (!(p < 1)) return n;
  const flip = p > 0.5;
  const r = flip ? 1 - p : p;
  let x = 0;
  if (n * r < 500) {
    const odds = r / (1 - r);
    let f = Math.exp(n * Math.log1p(-r));
    let u = rnd();
    const mean = n * r;
    while (u >= f && x < n) {
      if (f < 1e-20 && x > mean) break; // only the rounding residue of u is left
      u -= f;
      x++;
      f *= (odds * (n - x + 1)) / x;
    }
  } else {
    for (let i = 0; i < n; i++) if (rnd() < r) x++;
  }
  return flip ? n - x : x;
}
