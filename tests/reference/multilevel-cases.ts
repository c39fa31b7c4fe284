// Cases for the R comparison of poolMultilevel() and robustPool(): metafor's bundled data sets exported by R
// (Konstantopoulos 2011; Assink & Wibbelink 2016) and seeded invented sets (singleton clusters, σ² at either
// boundary, all singletons, identical effects, two clusters, moderators), each under test = "z" and "t".
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { gaussian, mulberry32 } from '../support/random.js';
import { runR } from './r-reference.js';
import { relErr } from './python-reference.js';
import { poolMultilevel, robustPool } from '../../shared/stats/index.js';

export interface DataCase {
  name: string;
  effects: number[];
  variances: number[];
  cluster: (string | number)[];
  moderators?: number[][];
  level: number;
}

export interface Case extends DataCase {
  id: string;
  test: 'z' | 't';
}

export interface RFit {
  k: number;
  clusters: number;
  sigma2: number[];
  /** metafor's own optimum before the polish */
  sigma2_free: number[];
  loglik_free: number;
  b: number[];
  se: number[];
  zval: number[];
  pval: number[];
  ci_lb: number[];
  ci_ub: number[];
  ddf: number | null;
  QE: number;
  QE_df: number;
  QEp: number;
  I2_between: number;
  I2_within: number;
  pi_lb: number;
  pi_ub: number;
  loglik: number;
  robust: { beta: number[]; se: number[]; t: number[]; df: number[]; p: number[]; ci_lb: number[]; ci_ub: number[] };
}

interface Bundled {
  effects: number[];
  variances: number[];
  cluster: number[];
  moderators: number[][];
  moderator_names: string[];
}

interface Shape {
  sizes: number[];
  mu: number;
  sigma2Between: number;
  sigma2Within: number;
  vmin: number;
  vmax: number;
  /** within-cluster deviations scaled to this fraction of √v (forces σ²_within to 0) */
  withinShrink?: number;
  /** subtract each cluster's mean deviation (forces σ²_between to 0) */
  centreClusters?: boolean;
  labels?: 'string' | 'number';
  slope?: number;
  clusterSlope?: number;
}

/** y_ij = μ + slope·x_ij + clusterSlope·z_j + u_j + e_ij + √v_ij·ε_ij with cluster sizes `sizes`. */
export function invented(name: string, seed: number, s: Shape, level = 0.95): DataCase {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const effects: number[] = [];
  const variances: number[] = [];
  const cluster: (string | number)[] = [];
  const x: number[] = [];
  const zc: number[] = [];
  s.sizes.forEach((n, j) => {
    const u = Math.sqrt(s.sigma2Between) * z();
    const zj = Math.round(10 * rnd()) / 10;
    const devs: number[] = [];
    const vs: number[] = [];
    for (let i = 0; i < n; i++) {
      const v = s.vmin + (s.vmax - s.vmin) * rnd();
      vs.push(v);
      const sd = s.withinShrink !== undefined ? s.withinShrink * Math.sqrt(v) : Math.sqrt(v + s.sigma2Within);
      devs.push(sd * z());
    }
    const mean = s.centreClusters ? devs.reduce((a, b) => a + b, 0) / n : 0;
    for (let i = 0; i < n; i++) {
      const xi = Math.round(100 * (rnd() - 0.5)) / 10;
      x.push(xi);
      zc.push(zj);
      effects.push(s.mu + (s.slope ?? 0) * xi + (s.clusterSlope ?? 0) * zj + (s.centreClusters ? 0 : u) + devs[i] - mean);
      variances.push(vs[i]);
      cluster.push(s.labels === 'string' ? `paper-${(j * 7919) % 1000}` : j + 1);
    }
  });
  const moderators = s.slope !== undefined ? (s.clusterSlope !== undefined ? [x, zc] : [x]) : undefined;
  return { name, effects, variances, cluster, moderators, level };
}

export function dataCases(): DataCase[] {
  const bundled = runR<Record<'konstantopoulos2011' | 'assink2016', Bundled>>('multilevel_reference.R', ['export']);
  const k11 = bundled.konstantopoulos2011;
  const a16 = bundled.assink2016;
  const base = (b: Bundled) => ({ effects: b.effects, variances: b.variances, cluster: b.cluster, level: 0.95 });
  const mixed = [1, 3, 1, 2, 5, 1, 4, 2, 1, 6, 3, 1, 2, 1, 4, 2, 1, 3, 1, 5];
  const cases: DataCase[] = [
    { name: 'Konstantopoulos 2011', ...base(k11) },
    { name: 'Konstantopoulos 2011, moderator year', ...base(k11), moderators: [k11.moderators[0]] },
    { name: 'Assink & Wibbelink 2016', ...base(a16) },
    { name: 'Assink & Wibbelink 2016, moderator year', ...base(a16), moderators: [a16.moderators[0]] },
    { name: 'Assink & Wibbelink 2016, year and delinquency type', ...base(a16), moderators: a16.moderators, level: 0.9 },
    invented('mixed sizes with singletons, string labels', 11, {
      sizes: mixed, mu: 0.3, sigma2Between: 0.06, sigma2Within: 0.03, vmin: 0.01, vmax: 0.12, labels: 'string',
    }),
    invented('mixed sizes with singletons, two moderators', 12, {
      sizes: mixed, mu: 0.2, sigma2Between: 0.04, sigma2Within: 0.02, vmin: 0.01, vmax: 0.1, slope: 0.05, clusterSlope: 0.4,
    }),
    invented('between-cluster variance at 0', 13, {
      sizes: [4, 3, 5, 2, 4, 3, 6, 2], mu: 0.1, sigma2Between: 0, sigma2Within: 0.05, vmin: 0.01, vmax: 0.05, centreClusters: true,
    }),
    invented('within-cluster variance at 0', 14, {
      sizes: [3, 4, 2, 5, 3, 4, 2, 3, 4], mu: -0.2, sigma2Between: 0.08, sigma2Within: 0, vmin: 0.02, vmax: 0.08, withinShrink: 0.3,
    }),
    invented('both variances at 0', 15, {
      sizes: [2, 3, 2, 4, 1, 3], mu: 0.4, sigma2Between: 0, sigma2Within: 0, vmin: 0.02, vmax: 0.2, withinShrink: 0.2, centreClusters: true,
    }),
    invented('within-cluster variance at 0, with a moderator', 16, {
      sizes: [3, 4, 2, 5, 3, 4, 2, 3, 4, 3], mu: 0.1, sigma2Between: 0.05, sigma2Within: 0, vmin: 0.02, vmax: 0.08, withinShrink: 0.3, slope: 0.03,
    }),
    invented('all singletons', 17, {
      sizes: Array(15).fill(1), mu: 0.25, sigma2Between: 0.05, sigma2Within: 0.05, vmin: 0.01, vmax: 0.1,
    }),
    // a paper of 60 effects: its CR2 block (60×60) goes through the Householder + QL eigen-decomposition
    invented('one paper of 60 effects among small ones', 21, {
      sizes: [60, 3, 4, 2, 5, 3, 4, 1, 6, 2, 3], mu: 0.2, sigma2Between: 0.05, sigma2Within: 0.03, vmin: 0.01, vmax: 0.1,
    }),
    invented('two clusters', 18, { sizes: [4, 5], mu: 0.3, sigma2Between: 0.05, sigma2Within: 0.02, vmin: 0.01, vmax: 0.05 }),
    invented('200 effects in 40 clusters, moderator, 90% level', 19, {
      sizes: Array.from({ length: 40 }, (_, j) => 1 + ((j * 3) % 9)).slice(0, 40), mu: 0.5, sigma2Between: 0.1,
      sigma2Within: 0.04, vmin: 0.005, vmax: 0.2, slope: -0.02,
    }, 0.9),
  ];
  const carried = invented('', 31, { sizes: [3, 4, 2, 5, 3, 4], mu: 0.2, sigma2Between: 0.05, sigma2Within: 0.02, vmin: 0.01, vmax: 0.08 });
  cases.push({
    ...carried,
    name: 'a moderator carried by one cluster (singular CR2 block)',
    moderators: [carried.cluster.map((id) => (id === 2 ? 1 : 0)), carried.effects.map((_, i) => (i % 3) / 2)],
  });
  const identical = invented('identical effects', 20, { sizes: [3, 2, 4, 1], mu: 0, sigma2Between: 0, sigma2Within: 0, vmin: 0.02, vmax: 0.1 });
  cases.push({ ...identical, effects: identical.effects.map(() => 0.42) });
  return cases;
}

/** Fits every case × test with metafor/clubSandwich in one R run. */
export function referenceFits(data: DataCase[]): { cases: Case[]; fits: Record<string, RFit> } {
  const cases: Case[] = data.flatMap((d, i) => (['z', 't'] as const).map((test) => ({ ...d, id: `c${i}${test}`, test })));
  const dir = mkdtempSync(path.join(tmpdir(), 'chronometa-multilevel-'));
  try {
    writeFileSync(path.join(dir, 'cases.csv'), ['id,test,level', ...cases.map((c) => `${c.id},${c.test},${c.level}`)].join('\n'));
    for (const c of cases) {
      const mods = c.moderators ?? [];
      const header = ['yi', 'vi', 'cluster', ...mods.map((_, m) => `m${m + 1}`)].join(',');
      const rows = c.effects.map((y, i) => [y, c.variances[i], JSON.stringify(String(c.cluster[i])), ...mods.map((col) => col[i])].join(','));
      writeFileSync(path.join(dir, `${c.id}.csv`), [header, ...rows].join('\n'));
    }
    return { cases, fits: runR<Record<string, RFit>>('multilevel_reference.R', ['fit', dir]) };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function typicalVariance(v: number[]): number {
  const s1 = v.reduce((a, x) => a + 1 / x, 0);
  const s2 = v.reduce((a, x) => a + 1 / (x * x), 0);
  return ((v.length - 1) * s1) / (s1 * s1 - s2);
}

/** The library input of a case (without `test`). */
export function input(c: Case) {
  return { effects: c.effects, variances: c.variances, cluster: c.cluster, moderators: c.moderators, level: c.level };
}

/** Relative error per field; `scale` is the size below which the error counts absolutely. */
export function comparePool(c: Case, ref: RFit): Record<string, number> {
  const r = poolMultilevel({ ...input(c), test: c.test });
  const out: Record<string, number> = {};
  const put = (name: string, actual: number | null, expected: number | null, scale: number) => {
    out[name] = actual === null || expected === null ? (actual === expected ? 0 : Infinity) : relErr(actual, expected, scale);
  };
  const vt = typicalVariance(c.variances);
  put('k', r.k, ref.k, 0);
  put('clusters', r.clusters, ref.clusters, 0);
  put('estimate', r.estimate, ref.b[0], ref.se[0]);
  put('se', r.se, ref.se[0], 0);
  put('ci_lower', r.ci_lower, ref.ci_lb[0], ref.se[0]);
  put('ci_upper', r.ci_upper, ref.ci_ub[0], ref.se[0]);
  put('statistic', r.statistic, ref.zval[0], 1);
  put('statistic_df', r.statistic_df, ref.ddf, 0);
  put('p', r.p, ref.pval[0], 1e-300);
  put('sigma2_between', r.sigma2_between, ref.sigma2[0], vt);
  put('sigma2_within', r.sigma2_within, ref.sigma2[1], vt);
  put('Q', r.Q, ref.QE, 1);
  put('Q_df', r.Q_df, ref.QE_df, 0);
  put('Q_p', r.Q_p, ref.QEp, 1e-300);
  put('I2_between', r.I2_between, ref.I2_between, 1);
  put('I2_within', r.I2_within, ref.I2_within, 1);
  put('pi_lower', r.pi_lower, ref.pi_lb, ref.se[0]);
  put('pi_upper', r.pi_upper, ref.pi_ub, ref.se[0]);
  put('loglik', r.loglik, ref.loglik, 1);
  (r.coefficients ?? []).forEach((co, a) => {
    put(`b${a}.estimate`, co.estimate, ref.b[a], ref.se[a]);
    put(`b${a}.se`, co.se, ref.se[a], 0);
    put(`b${a}.statistic`, co.statistic, ref.zval[a], 1);
    put(`b${a}.p`, co.p, ref.pval[a], 1e-300);
    put(`b${a}.ci_lower`, co.ci_lower, ref.ci_lb[a], ref.se[a]);
    put(`b${a}.ci_upper`, co.ci_upper, ref.ci_ub[a], ref.se[a]);
  });
  return out;
}

export function compareRobust(c: Case, ref: RFit): Record<string, number> {
  const r = robustPool(input(c));
  const rr = ref.robust;
  const out: Record<string, number> = {};
  const put = (name: string, actual: number, expected: number, scale: number) => (out[name] = relErr(actual, expected, scale));
  put('robust estimate', r.estimate, rr.beta[0], rr.se[0]);
  put('robust se', r.se, rr.se[0], 0);
  put('robust df', r.df, rr.df[0], 0);
  put('robust t', r.t, rr.t[0], 1);
  put('robust p', r.p, rr.p[0], 1e-300);
  put('robust ci_lower', r.ci_lower, rr.ci_lb[0], rr.se[0]);
  put('robust ci_upper', r.ci_upper, rr.ci_ub[0], rr.se[0]);
  (r.coefficients ?? []).forEach((co, a) => {
    put(`robust b${a}.estimate`, co.estimate, rr.beta[a], rr.se[a]);
    put(`robust b${a}.se`, co.se, rr.se[a], 0);
    put(`robust b${a}.df`, co.df, rr.df[a], 0);
    put(`robust b${a}.statistic`, co.statistic, rr.t[a], 1);
    put(`robust b${a}.p`, co.p, rr.p[a], 1e-300);
    put(`robust b${a}.ci_lower`, co.ci_lower, rr.ci_lb[a], rr.se[a]);
    put(`robust b${a}.ci_upper`, co.ci_upper, rr.ci_ub[a], rr.se[a]);
  });
  return out;
}

