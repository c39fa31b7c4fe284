// Benchmark for issue 15: `npm run bench -- psychophysics`.
// (a) 200 participants × 2 conditions of an order task (9 SOAs × 40 trials), each fitted (cumulative Gaussian)
//     with a 1,000-resample parametric bootstrap, on a pool of 2 worker threads (server/psychophysics/fit-pool.ts).
//     Target: < 15 s. Also the same work's rate on the main thread (a sample of fits) for the parallel speed-up.
// (b) one fitPsychometric call against a statsmodels GLM fit (Binomial, probit and logit) of the same data,
//     timed inside Debian's python3 with many repetitions (start-up excluded). Target: ≥ 20×.
import { spawnSync } from 'node:child_process';
import { bootstrapFit, fitPsychometric, type PsychometricInput } from '../../shared/psychophysics/index.js';
import { createFitPool, type BootstrapTask } from '../../server/psychophysics/fit-pool.js';
import { normalTwoTailed } from '../../shared/stats/normal.js';
import { gaussian, mulberry32 } from '../support/random.js';

const phi = (z: number) => (z < 0 ? 0.5 * normalTwoTailed(z) : 1 - 0.5 * normalTwoTailed(z));

const SOAS = [-240, -180, -120, -60, 0, 60, 120, 180, 240];
const TRIALS = 40;

/** Invented order-task counts: per participant a PSS and σ, shifted by 25 ms in the second condition. */
function participants(count: number, seed: number): PsychometricInput[] {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const out: PsychometricInput[] = [];
  for (let p = 0; p < count; p++) {
    const pss = 20 + 30 * z();
    const sigma = 60 + 40 * rnd();
    for (const shift of [0, 25]) {
      const k = SOAS.map((x) => {
        const prob = phi((x - pss - shift) / sigma);
        let hits = 0;
        for (let t = 0; t < TRIALS; t++) if (rnd() < prob) hits++;
        return hits;
      });
      out.push({ x: SOAS, n: SOAS.map(() => TRIALS), k, model: 'cumulative_gaussian' });
    }
  }
  return out;
}

const fmt = (ms: number) => (ms < 1 ? `${(ms * 1000).toFixed(1)} µs` : ms < 1000 ? `${ms.toFixed(1)} ms` : `${(ms / 1000).toFixed(2)} s`);

// (a) ------------------------------------------------------------------------------------------------------
const inputs = participants(200, 15);
const tasks: BootstrapTask[] = inputs.map((input, i) => ({ input, options: { resamples: 1000, seed: 1000 + i } }));

const t0 = performance.now();
const pool = createFitPool({ size: 2 });
const warm = await pool.run(tasks.slice(0, 2).map((t) => ({ ...t, options: { resamples: 10, seed: 1 } })));
const tStart = performance.now() - t0;
const t1 = performance.now();
const results = await pool.run(tasks);
const tRun = performance.now() - t1;
await pool.close();

const failedRefits = results.reduce((s, r) => s + r.failed, 0);
const unconverged = results.filter((r) => !r.fit.converged).length;
// the pool gives exactly what the engine gives on this thread (a sample; results are seeded)
const sampleSize = 20;
const t2 = performance.now();
const sameAsMain = tasks.slice(0, sampleSize).every((t, i) => JSON.stringify(bootstrapFit(t.input, t.options)) === JSON.stringify(results[i]));
const perFitMain = (performance.now() - t2) / sampleSize;
const refits = tasks.length * 1000;
console.log(
  `(a) ${inputs.length / 2} participants × 2 conditions × ${SOAS.length} levels × ${TRIALS} trials, cumulative Gaussian, ` +
    `1,000 bootstrap resamples each (${refits.toLocaleString('en')} refits) on ${pool.size} worker threads: ` +
    `${fmt(tRun)} (target < 15 s: ${tRun < 15_000 ? 'met' : 'NOT met'}); pool start ${fmt(tStart)}; ` +
    `${(refits / (tRun / 1000)).toFixed(0)} refits/s; one bootstrap on the main thread ${fmt(perFitMain)} ` +
    `(speed-up ${((perFitMain * tasks.length) / tRun).toFixed(2)}×); ${failedRefits} refits without a finite maximum, ` +
    `${unconverged} fits unconverged; pool = main thread: ${sameAsMain ? 'yes' : 'NO'}; warm-up ${warm.length} tasks`,
);

// (b) ------------------------------------------------------------------------------------------------------
const one = inputs[0];
const PY = `
import sys, json, time, statistics, warnings
import numpy as np
import statsmodels.api as sm
warnings.simplefilter("ignore")
d = json.loads(sys.argv[1])
x = np.array(d["x"], float); n = np.array(d["n"], float); k = np.array(d["k"], float)
endog = np.column_stack([k, n - k]); exog = sm.add_constant(x)
out = {}
for name, link in (("probit", sm.families.links.probit()), ("logit", sm.families.links.logit())):
    fam = sm.families.Binomial(link=link)
    def full():
        return sm.GLM(endog, exog, family=fam).fit()
    model = sm.GLM(endog, exog, family=fam)
    def fit_only():
        return model.fit()
    res = {}
    for label, fn in (("model_and_fit", full), ("fit_only", fit_only)):
        for _ in range(20): fn()
        batches = []
        for _ in range(15):
            t = time.perf_counter()
            for _ in range(40): r = fn()
            batches.append((time.perf_counter() - t) / 40 * 1000)
        res[label] = statistics.median(batches)
    a, b = r.params
    res["pse"] = float(-a / b)
    out[name] = res
print(json.dumps(out))
`;
function timeStatsmodels(): Record<string, { model_and_fit: number; fit_only: number; pse: number }> | null {
  const py = spawnSync('/usr/bin/python3', ['-c', PY, JSON.stringify(one)], { encoding: 'utf8' });
  if (py.status === 0) return JSON.parse(py.stdout);
  console.log(`statsmodels not timed (${(py.stderr || py.error?.message || '').trim().split('\n').pop()}); apt-get install -y python3-statsmodels`);
  return null;
}

function medianBatchMs(fn: () => unknown, batches: number, perBatch: number): number {
  for (let i = 0; i < 2000; i++) fn();
  const times: number[] = [];
  for (let b = 0; b < batches; b++) {
    const t = performance.now();
    for (let i = 0; i < perBatch; i++) fn();
    times.push((performance.now() - t) / perBatch);
  }
  return median(times);
}

function median(xs: number[]): number {
  const s = [...xs].sort((p, q) => p - q);
  return s[Math.floor(s.length / 2)];
}

// three rounds, statsmodels and this engine one after the other in each, so a change in the machine's load
// affects both sides of a ratio alike; the medians over rounds are reported
const LINKS = [['cumulative_gaussian', 'probit'], ['logistic', 'logit']] as const;
const rounds: { link: string; ours: number; sm: { model_and_fit: number; fit_only: number; pse: number } | null; agree: boolean }[][] = [];
for (let r = 0; r < 3; r++) {
  const sm = timeStatsmodels();
  rounds.push(
    LINKS.map(([model, link]) => {
      const input = { ...one, model };
      const ours = medianBatchMs(() => fitPsychometric(input), 31, 1000);
      const s = sm?.[link] ?? null;
      const agree = s ? Math.abs(fitPsychometric(input).pse! - s.pse) <= 1e-6 * Math.max(1, Math.abs(s.pse)) : true;
      return { link, ours, sm: s, agree };
    }),
  );
}
for (const [j, [, link]] of LINKS.entries()) {
  const rs = rounds.map((round) => round[j]);
  const ours = median(rs.map((x) => x.ours));
  const timed = rs.every((x) => x.sm);
  const full = timed ? median(rs.map((x) => x.sm!.model_and_fit)) : NaN;
  const fitOnly = timed ? median(rs.map((x) => x.sm!.fit_only)) : NaN;
  const ratio = timed ? median(rs.map((x) => x.sm!.fit_only / x.ours)) : NaN;
  const ratioFull = timed ? median(rs.map((x) => x.sm!.model_and_fit / x.ours)) : NaN;
  console.log(
    `(b) one fit, 9 levels × ${TRIALS} trials, ${link}: fitPsychometric ${fmt(ours)}` +
      (timed
        ? `; statsmodels GLM construction + fit ${fmt(full)} (${ratioFull.toFixed(0)}×), fit only ${fmt(fitOnly)} (${ratio.toFixed(0)}×)` +
          `  (target ≥ 20×: ${ratio >= 20 ? 'met' : 'NOT met'}); same PSE: ${rs.every((x) => x.agree) ? 'yes' : 'NO'}; medians of 3 rounds`
        : ''),
  );
}
