// Benchmark for issue 14 (not a timed test): `npm run bench -- multilevel` runs it with tsx.
// k = 5,000 effects in 500 clusters (1 to 19 effects each): the median time of poolMultilevel (and of
// robustPool, for information) against metafor's rma.mv(yi, vi, random = ~ 1 | cluster/effect,
// method = "REML", sparse = TRUE) timed inside the same Rscript run (R's start-up and package loading
// excluded), the ratio, and how far the two fits' estimates lie apart. Target: ≥ 100× with equal estimates.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { poolMultilevel, robustPool } from '../../shared/stats/index.js';
import { gaussian, mulberry32 } from '../support/random.js';

const K = 5_000;
const CLUSTERS = 500;

function dataSet(seed: number) {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const effects = new Float64Array(K);
  const variances = new Float64Array(K);
  const cluster = new Int32Array(K);
  const sizes = Array.from({ length: CLUSTERS }, () => 1 + Math.floor(19 * rnd()));
  const total = sizes.reduce((a, b) => a + b, 0);
  const scaled = sizes.map((n) => Math.max(1, Math.round((n * K) / total)));
  let i = 0;
  for (let j = 0; j < CLUSTERS && i < K; j++) {
    const u = Math.sqrt(0.06) * z();
    const n = j === CLUSTERS - 1 ? K - i : Math.min(scaled[j], K - i - (CLUSTERS - 1 - j));
    for (let m = 0; m < n; m++, i++) {
      variances[i] = 0.01 + 0.15 * rnd();
      effects[i] = 0.3 + u + Math.sqrt(variances[i] + 0.03) * z();
      cluster[i] = j + 1;
    }
  }
  return { effects, variances, cluster };
}

function median(fn: () => unknown, reps: number): number {
  fn();
  const times: number[] = [];
  for (let r = 0; r < reps; r++) {
    const t = performance.now();
    fn();
    times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(reps / 2)];
}

const R = `
suppressPackageStartupMessages(library(metafor))
args <- commandArgs(trailingOnly = TRUE)
k <- as.integer(args[4])
yi <- readBin(args[1], "double", k, endian = "little")
vi <- readBin(args[2], "double", k, endian = "little")
cl <- readBin(args[3], "integer", k, endian = "little")
dat <- data.frame(yi = yi, vi = vi, cluster = cl, effect = seq_len(k))
t0 <- proc.time()[["elapsed"]]
fit <- rma.mv(yi, vi, random = ~ 1 | cluster/effect, data = dat, method = "REML", sparse = TRUE)
ms <- 1000 * (proc.time()[["elapsed"]] - t0)
cat(sprintf('{"ms":%.17g,"estimate":%.17g,"se":%.17g,"sigma2_between":%.17g,"sigma2_within":%.17g,"loglik":%.17g,"version":"%s"}',
  ms, fit$b[1], fit$se, fit$sigma2[1], fit$sigma2[2], as.numeric(logLik(fit)), as.character(packageVersion("metafor"))))
`;

const data = dataSet(2024);
const dir = mkdtempSync(path.join(tmpdir(), 'chronometa-bench-ml-'));
const files = ['y', 'v', 'c'].map((n) => path.join(dir, `${n}.bin`));
writeFileSync(files[0], Buffer.from(data.effects.buffer));
writeFileSync(files[1], Buffer.from(data.variances.buffer));
writeFileSync(files[2], Buffer.from(data.cluster.buffer));
const r = spawnSync('Rscript', ['--vanilla', '-e', R, ...files, String(K)], { encoding: 'utf8', maxBuffer: 1 << 26 });
rmSync(dir, { recursive: true, force: true });
const ref: { ms: number; estimate: number; se: number; sigma2_between: number; sigma2_within: number; loglik: number; version: string } | null =
  r.status === 0 ? JSON.parse(r.stdout) : null;
if (!ref) console.log(`rma.mv not timed (${(r.stderr || r.error?.message || '').trim().split('\n').pop()}); apt-get install -y --no-install-recommends r-cran-metafor`);

const input = { effects: data.effects, variances: data.variances, cluster: data.cluster };
const tPool = median(() => poolMultilevel(input), 31);
const tRobust = median(() => robustPool(input), 11);
const ours = poolMultilevel(input);
const fmt = (ms: number) => (ms < 1 ? `${(ms * 1000).toFixed(0)} µs` : `${ms.toFixed(2)} ms`);

console.log(`three-level REML, k = ${K} effects in ${CLUSTERS} clusters (medians)`);
console.log(`  poolMultilevel ${fmt(tPool)}; robustPool (fit + CR2 + Satterthwaite) ${fmt(tRobust)}`);
if (ref) {
  console.log(`  metafor ${ref.version} rma.mv(sparse = TRUE), timed inside R: ${fmt(ref.ms)}`);
  const ratio = ref.ms / tPool;
  console.log(`  ratio rma.mv / poolMultilevel: ${ratio.toFixed(0)}× (target ≥ 100×)${ratio >= 100 ? '' : '  — BELOW TARGET'}`);
  const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
  const diffs = {
    estimate: rel(ours.estimate, ref.estimate),
    se: rel(ours.se, ref.se),
    sigma2_between: rel(ours.sigma2_between, ref.sigma2_between),
    sigma2_within: rel(ours.sigma2_within, ref.sigma2_within),
  };
  const worst = Math.max(...Object.values(diffs));
  console.log(
    `  agreement (relative): ${Object.entries(diffs).map(([k, v]) => `${k} ${v.toExponential(1)}`).join(', ')}; ` +
      `restricted log-likelihood ours − rma.mv = ${(ours.loglik - ref.loglik).toExponential(2)}` +
      (worst <= 1e-6 ? '  (equal within 1e-6)' : '  — ESTIMATES DIFFER'),
  );
}
