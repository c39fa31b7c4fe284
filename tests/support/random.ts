// The one seeded pseudo-random generator of the tests, benchmarks and demo seeds: the same seed gives the same
// numbers on every run and machine.

/** mulberry32: a small 32-bit generator with good statistical quality for test data; uniform on [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal draws from a uniform generator (Box–Muller, one value per pair of uniforms). */
export function gaussian(rnd: () => number): () => number {
  return () => {
    const u = rnd() || 1e-12;
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rnd());
  };
}

export interface RandomEffects {
  effects: number[];
  variances: number[];
}

/** k effects yᵢ = μ + √(vᵢ + τ²)·zᵢ with within-study variances vᵢ uniform in [vmin, vmax]. */
export function randomEffects(seed: number, k: number, p: { mu: number; tau2: number; vmin: number; vmax: number }): RandomEffects {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const variances = Array.from({ length: k }, () => p.vmin + (p.vmax - p.vmin) * rnd());
  const effects = variances.map((v) => p.mu + Math.sqrt(v + p.tau2) * z());
  return { effects, variances };
}
