// Benchmark for issue 3 (not a timed test): `npm run bench` runs it with tsx.
// For k = 10³, 10⁵, 10⁶ heterogeneous effects it prints the median time of
//   pool (DL, full result: Q-profile interval, Egger, weights, prediction interval),
//   the floor: a bare three-pass Float64Array loop computing only the DL estimate,
//   statsmodels combine_effects(method_re="chi2") timed inside Debian's python3 in the same run,
// and the ratios; then leave-one-out and cumulative (DL) at k = 10⁴ as multiples of one pool call.
// Targets: pool ≤ 10× floor and faster than statsmodels at 10⁶; leave-one-out and cumulative ≤ 5× pool.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pool, leaveOneOut, cumulative } from '../../shared/stats/index.js';
import { randomEffects } from '../support/random.js';

/** Heterogeneous effects (τ² = 0.08 around 0.3) as typed arrays, from the one seeded generator. */
function heterogeneous(k: number, seed: number) {
  const { effects, variances } = randomEffects(seed, k, { mu: 0.3, tau2: 0.08, vmin: 0.005, vmax: 0.305 });
  return { effects: Float64Array.from(effects), variances: Float64Array.from(variances) };
}

function median(fn: () => unknown, reps: number): number {
  fn();
  fn();
  const times: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t = performance.now();
    fn();
    times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(reps / 2)];
}

/** The floor: the DL estimate only, three passes, no validation, no extras. */
function floorDL(y: Float64Array, v: Float64Array): number {
  const k = y.length;
  let sw = 0, swy = 0, sw2 = 0;
  for (let i = 0; i < k; i++) {
    const w = 1 / v[i];
    sw += w;
    swy += w * y[i];
    sw2 += w * w;
  }
  const mu = swy / sw;
  let q = 0;
  for (let i = 0; i < k; i++) {
    const d = y[i] - mu;
    q += (d * d) / v[i];
  }
  const tau2 = Math.max(0, (q - (k - 1)) / (sw - sw2 / sw));
  let s0 = 0, s1 = 0;
  for (let i = 0; i < k; i++) {
    const w = 1 / (v[i] + tau2);
    s0 += w;
    s1 += w * y[i];
  }
  return s1 / s0;
}

const PY = `
import sys, time, json, statistics, warnings
import numpy as np
from statsmodels.stats.meta_analysis import combine_effects
warnings.simplefilter("ignore")
out = {}
for spec in json.loads(sys.argv[1]):
    y = np.fromfile(spec["y"], dtype="<f8"); v = np.fromfile(spec["v"], dtype="<f8")
    combine_effects(y, v, method_re="chi2")
    times = []
    for _ in range(spec["reps"]):
        t = time.perf_counter(); r = combine_effects(y, v, method_re="chi2"); r.conf_int(); times.append((time.perf_counter() - t) * 1000)
    out[str(len(y))] = {"ms": statistics.median(times), "estimate": float(r.mean_effect_re)}
print(json.dumps(out))
`;

const sizes = [1_000, 100_000, 1_000_000];
const reps = (k: number) => (k >= 1_000_000 ? 9 : k >= 100_000 ? 21 : 201);
const dir = mkdtempSync(path.join(tmpdir(), 'chronometa-bench-'));
const data = new Map(sizes.map((k, i) => [k, heterogeneous(k, 42 + i)]));
const specs = sizes.map((k) => {
  const d = data.get(k)!;
  const y = path.join(dir, `y${k}.f64`);
  const v = path.join(dir, `v${k}.f64`);
  writeFileSync(y, Buffer.from(d.effects.buffer));
  writeFileSync(v, Buffer.from(d.variances.buffer));
  return { y, v, reps: reps(k) };
});

const py = spawnSync('/usr/bin/python3', ['-c', PY, JSON.stringify(specs)], { encoding: 'utf8', maxBuffer: 1 << 26 });
rmSync(dir, { recursive: true, force: true });
const sm: Record<string, { ms: number; estimate: number }> | null = py.status === 0 ? JSON.parse(py.stdout) : null;
if (!sm) console.log(`statsmodels not timed (${(py.stderr || py.error?.message || '').trim().split('\n').pop()}); apt-get install -y python3-statsmodels`);

const fmt = (ms: number) => (ms < 1 ? `${(ms * 1000).toFixed(0)} µs` : `${ms.toFixed(2)} ms`);
console.log('pool (DL, full result) vs floor (three-pass DL estimate) vs statsmodels combine_effects (DL), medians');
console.log('k'.padStart(9), 'pool'.padStart(11), 'floor'.padStart(11), 'pool/floor'.padStart(11), 'statsmodels'.padStart(12), 'sm/pool'.padStart(9));
for (const k of sizes) {
  const { effects, variances } = data.get(k)!;
  const tPool = median(() => pool({ effects, variances, method: 'DL' }), reps(k));
  const tFloor = median(() => floorDL(effects, variances), reps(k));
  const s = sm?.[String(k)];
  const same = s ? Math.abs(pool({ effects, variances }).estimate - s.estimate) <= 1e-9 * Math.abs(s.estimate) : true;
  console.log(
    String(k).padStart(9),
    fmt(tPool).padStart(11),
    fmt(tFloor).padStart(11),
    `${(tPool / tFloor).toFixed(1)}×`.padStart(11),
    (s ? fmt(s.ms) : 'n/a').padStart(12),
    (s ? `${(s.ms / tPool).toFixed(2)}×` : 'n/a').padStart(9),
    same ? '' : '  (estimates differ!)',
  );
}

const k4 = heterogeneous(10_000, 7);
const tPool4 = median(() => pool({ ...k4, method: 'DL' }), 101);
const tLoo = median(() => leaveOneOut({ ...k4, method: 'DL' }), 41);
const tCum = median(() => cumulative({ ...k4, method: 'DL' }), 41);
console.log(`k = 10⁴, DL: pool ${fmt(tPool4)}, leave-one-out ${fmt(tLoo)} (${(tLoo / tPool4).toFixed(1)}× pool), cumulative ${fmt(tCum)} (${(tCum / tPool4).toFixed(1)}× pool)`);
