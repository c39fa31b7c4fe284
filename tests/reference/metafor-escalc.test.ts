// computeEffect against R metafor's escalc() (Debian's r-cran-metafor), on metafor's bundled published data
// sets and on invented sheets. Tolerance 1e-9 relative: every measure here is closed form.
import { beforeAll, describe, expect, it } from 'vitest';
import { computeEffect } from '../../shared/stats/index.js';
import { Agreement, CLOSED, report, rVector, runRSource } from './r-reference.js';
import { gaussian, mulberry32 } from '../support/random.js';

type Col = number[];
interface Escalc { yi: Col; vi: Col }

/** Invented within-subject sheets: condition means, SDs, n and r, seeded. */
function pairedSheet(seed: number, k: number) {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const rows = Array.from({ length: k }, () => {
    const n = 8 + Math.floor(rnd() * 40);
    const sd1 = 40 + 80 * rnd();
    const sd2 = sd1 * (0.7 + 0.6 * rnd());
    return { m1: 600 + 60 * z(), m2: 580 + 60 * z(), sd1, sd2, n, r: -0.3 + 1.25 * rnd() };
  });
  return { m1: rows.map((r) => r.m1), m2: rows.map((r) => r.m2), sd1: rows.map((r) => r.sd1), sd2: rows.map((r) => r.sd2), n: rows.map((r) => r.n), r: rows.map((r) => Math.min(0.95, r.r)) };
}

/** Invented two-group sheets (means, SDs, sizes) and 2×2 tables, some with zero cells. */
function groupSheet(seed: number, k: number) {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const n1 = Array.from({ length: k }, () => 2 + Math.floor(rnd() * 60));
  const n2 = Array.from({ length: k }, () => 2 + Math.floor(rnd() * 60));
  const m1 = n1.map(() => 900 + 100 * z());
  const m2 = n1.map(() => 850 + 100 * z());
  const sd1 = n1.map(() => 50 + 150 * rnd());
  const sd2 = n1.map(() => 50 + 150 * rnd());
  const t = n1.map(() => 3 * z());
  const a = n1.map((n) => Math.floor(rnd() * Math.min(n, 6)));
  const c = n2.map((n) => Math.floor(rnd() * Math.min(n, 9)));
  return { n1, n2, m1, m2, sd1, sd2, t, a, b: n1.map((n, i) => n - a[i]), c, d: n2.map((n, i) => n - c[i]) };
}

interface Reference {
  normand: { m1i: Col; sd1i: Col; n1i: Col; m2i: Col; sd2i: Col; n2i: Col; SMD: Escalc; MD: Escalc; ROM: Escalc };
  bcg: { tpos: Col; tneg: Col; cpos: Col; cneg: Col; OR: Escalc; OR2DL: Escalc };
  molloy: { ri: Col; ni: Col; ZCOR: Escalc };
  paired: { SMCR: Escalc; SMCC: Escalc; ROMC: Escalc; MC: Escalc; SMCC_t: Escalc };
  groups: { SMD: Escalc; SMD_t: Escalc; MD: Escalc; ROM: Escalc; OR: Escalc; OR2DL: Escalc; MN: Escalc };
}

const paired = pairedSheet(11, 60);
const groups = groupSheet(12, 60);
// SMCR standardizes by one raw-score SD: the engine's g_rm gets it as S_diff/√(2(1 − r)) with S_diff = sd1·√(2(1 − r))
const sdDiffRm = paired.sd1.map((s, i) => s * Math.sqrt(2 * (1 - paired.r[i])));
const sdDiff = paired.sd1.map((s, i) => Math.sqrt(s * s + paired.sd2[i] ** 2 - 2 * paired.r[i] * s * paired.sd2[i]));
const tPaired = paired.m1.map((m, i) => (m - paired.m2[i]) / (sdDiff[i] / Math.sqrt(paired.n[i])));

let ref: Reference;
beforeAll(() => {
  ref = runRSource<Reference>(`
yv <- function(x) list(yi = I(as.numeric(x$yi)), vi = I(as.numeric(x$vi)))
nd <- dat.normand1999
bcg <- dat.bcg
ml <- dat.molloy2014
m1 <- ${rVector(paired.m1)}; m2 <- ${rVector(paired.m2)}; sd1 <- ${rVector(paired.sd1)}; sd2 <- ${rVector(paired.sd2)}
n <- ${rVector(paired.n)}; r <- ${rVector(paired.r)}; tp <- ${rVector(tPaired)}
g <- list(n1 = ${rVector(groups.n1)}, n2 = ${rVector(groups.n2)}, m1 = ${rVector(groups.m1)}, m2 = ${rVector(groups.m2)},
  sd1 = ${rVector(groups.sd1)}, sd2 = ${rVector(groups.sd2)}, t = ${rVector(groups.t)},
  a = ${rVector(groups.a)}, b = ${rVector(groups.b)}, c = ${rVector(groups.c)}, d = ${rVector(groups.d)})
cat(to_json(list(
  normand = c(lapply(nd[, c("m1i", "sd1i", "n1i", "m2i", "sd2i", "n2i")], I),
    list(SMD = yv(escalc("SMD", m1i = m1i, sd1i = sd1i, n1i = n1i, m2i = m2i, sd2i = sd2i, n2i = n2i, data = nd)),
         MD = yv(escalc("MD", m1i = m1i, sd1i = sd1i, n1i = n1i, m2i = m2i, sd2i = sd2i, n2i = n2i, data = nd)),
         ROM = yv(escalc("ROM", m1i = m1i, sd1i = sd1i, n1i = n1i, m2i = m2i, sd2i = sd2i, n2i = n2i, data = nd)))),
  bcg = c(lapply(bcg[, c("tpos", "tneg", "cpos", "cneg")], I),
    list(OR = yv(escalc("OR", ai = tpos, bi = tneg, ci = cpos, di = cneg, data = bcg)),
         OR2DL = yv(escalc("OR2DL", ai = tpos, bi = tneg, ci = cpos, di = cneg, data = bcg)))),
  molloy = c(lapply(ml[, c("ri", "ni")], I), list(ZCOR = yv(escalc("ZCOR", ri = ri, ni = ni, data = ml)))),
  paired = list(
    SMCR = yv(escalc("SMCR", m1i = m1, m2i = m2, sd1i = sd1, ni = n, ri = r)),
    SMCC = yv(escalc("SMCC", m1i = m1, m2i = m2, sd1i = sd1, sd2i = sd2, ni = n, ri = r)),
    SMCC_t = yv(escalc("SMCC", m1i = tp / sqrt(n), m2i = 0 * n, sd1i = 1 + 0 * n, sd2i = 1 + 0 * n, ri = 0.5 + 0 * n, ni = n)),
    ROMC = yv(escalc("ROMC", m1i = m1, m2i = m2, sd1i = sd1, sd2i = sd2, ni = n, ri = r)),
    MC = yv(escalc("MC", m1i = m1, m2i = m2, sd1i = sd1, sd2i = sd2, ni = n, ri = r))),
  groups = with(g, list(
    SMD = yv(escalc("SMD", m1i = m1, sd1i = sd1, n1i = n1, m2i = m2, sd2i = sd2, n2i = n2)),
    SMD_t = yv(escalc("SMD", ti = t, n1i = n1, n2i = n2)),
    MD = yv(escalc("MD", m1i = m1, sd1i = sd1, n1i = n1, m2i = m2, sd2i = sd2, n2i = n2)),
    ROM = yv(escalc("ROM", m1i = m1, sd1i = sd1, n1i = n1, m2i = m2, sd2i = sd2, n2i = n2)),
    OR = yv(escalc("OR", ai = a, bi = b, ci = c, di = d)),
    OR2DL = yv(escalc("OR2DL", ai = a, bi = b, ci = c, di = d)),
    MN = yv(escalc("MN", mi = m1, sdi = sd1, ni = n1))))
)))
`);
}, 180_000);

/** Compares computeEffect on each row with escalc's yi and vi. */
function compare(label: string, expected: Escalc, inputs: Record<string, unknown>[], metric: string): Agreement {
  const a = new Agreement();
  inputs.forEach((input, i) => {
    const r = computeEffect(input);
    if (r.metric !== metric) a.errors.push(`${label}[${i}]: metric ${r.metric}, expected ${metric}`);
    a.check(`${label}[${i}] yi`, r.effect, expected.yi[i], CLOSED);
    a.check(`${label}[${i}] vi`, r.variance, expected.vi[i], CLOSED);
  });
  expect(a.compared).toBe(2 * inputs.length);
  report(`escalc ${label}`, a);
  return a;
}

const rows = (k: number, f: (i: number) => Record<string, unknown>) => Array.from({ length: k }, (_, i) => f(i));

describe('escalc (metafor) against computeEffect', () => {
  it('SMD, MD, ROM on dat.normand1999 (Normand 1999, length of hospital stay, 9 trials)', () => {
    const d = ref.normand;
    const k = d.n1i.length;
    const means = (measure: string) => rows(k, (i) => ({ measure, mean1: d.m1i[i], sd1: d.sd1i[i], n1: d.n1i[i], mean2: d.m2i[i], sd2: d.sd2i[i], n2: d.n2i[i] }));
    for (const a of [compare('SMD', d.SMD, means('smd'), 'g_s'), compare('MD', d.MD, means('mean_diff'), 'mean_diff'), compare('ROM', d.ROM, means('log_ratio'), 'log_ratio')])
      expect(a.errors).toEqual([]);
  });

  it('OR and OR2DL (Chinn 2000) on dat.bcg (Colditz et al. 1994, BCG vaccine trials)', () => {
    const d = ref.bcg;
    const k = d.tpos.length;
    const counts = (measure: string) => rows(k, (i) => ({ measure, events1: d.tpos[i], nonevents1: d.tneg[i], events2: d.cpos[i], nonevents2: d.cneg[i] }));
    expect(compare('OR', d.OR, counts('log_odds_ratio'), 'log_odds_ratio').errors).toEqual([]);
    expect(compare('OR2DL', d.OR2DL, counts('smd'), 'g_s').errors).toEqual([]);
  });

  it('ZCOR on dat.molloy2014 (Molloy et al. 2014, conscientiousness and adherence)', () => {
    const d = ref.molloy;
    const input = rows(d.ri.length, (i) => ({ measure: 'fisher_z', r: d.ri[i], n: d.ni[i] }));
    expect(compare('ZCOR', d.ZCOR, input, 'fisher_z').errors).toEqual([]);
  });

  it('SMCR (g_rm, Becker 1988), SMCC (g_z), ROMC and MC on an invented within-subject sheet of 60 rows', () => {
    const p = paired;
    const k = p.n.length;
    const checks = [
      compare('SMCR via sd_diff', ref.paired.SMCR, rows(k, (i) => ({ measure: 'smd_paired', mean_diff: p.m1[i] - p.m2[i], sd_diff: sdDiffRm[i], n: p.n[i], r: p.r[i] })), 'g_rm'),
      compare('SMCR via paired t', ref.paired.SMCR, rows(k, (i) => ({ measure: 'smd_paired', t: (p.m1[i] - p.m2[i]) / (sdDiffRm[i] / Math.sqrt(p.n[i])), n: p.n[i], r: p.r[i] })), 'g_rm'),
      compare('SMCC via condition SDs', ref.paired.SMCC, rows(k, (i) => ({ measure: 'd_z', mean1: p.m1[i], sd1: p.sd1[i], mean2: p.m2[i], sd2: p.sd2[i], n: p.n[i], r: p.r[i] })), 'g_z'),
      compare('SMCC via sd_diff (no r)', ref.paired.SMCC, rows(k, (i) => ({ measure: 'smd_paired', mean_diff: p.m1[i] - p.m2[i], sd_diff: sdDiff[i], n: p.n[i] })), 'g_z'),
      compare('SMCC via paired t (no r)', ref.paired.SMCC_t, rows(k, (i) => ({ measure: 'smd_paired', t: tPaired[i], n: p.n[i] })), 'g_z'),
      compare('ROMC', ref.paired.ROMC, rows(k, (i) => ({ measure: 'log_ratio_paired', mean1: p.m1[i], sd1: p.sd1[i], mean2: p.m2[i], sd2: p.sd2[i], n: p.n[i], r: p.r[i] })), 'log_ratio'),
      compare('MC', ref.paired.MC, rows(k, (i) => ({ measure: 'mean_diff', mean_diff: p.m1[i] - p.m2[i], sd_diff: sdDiff[i], n: p.n[i] })), 'mean_diff'),
    ];
    for (const a of checks) expect(a.errors).toEqual([]);
  });

  it('SMD (means and t), MD, ROM, MN, OR and OR2DL (with zero cells: 0.5 added to that table only) on an invented two-group sheet of 60 rows', () => {
    const g = groups;
    const k = g.n1.length;
    const means = (measure: string) => rows(k, (i) => ({ measure, mean1: g.m1[i], sd1: g.sd1[i], n1: g.n1[i], mean2: g.m2[i], sd2: g.sd2[i], n2: g.n2[i] }));
    const counts = (measure: string) => rows(k, (i) => ({ measure, events1: g.a[i], nonevents1: g.b[i], events2: g.c[i], nonevents2: g.d[i] }));
    expect(g.a.filter((x) => x === 0).length + g.c.filter((x) => x === 0).length).toBeGreaterThan(5);
    const checks = [
      compare('SMD', ref.groups.SMD, means('smd'), 'g_s'),
      compare('SMD from t', ref.groups.SMD_t, rows(k, (i) => ({ measure: 'smd', t: g.t[i], n1: g.n1[i], n2: g.n2[i] })), 'g_s'),
      compare('MD', ref.groups.MD, means('mean_diff'), 'mean_diff'),
      compare('ROM', ref.groups.ROM, means('log_ratio'), 'log_ratio'),
      compare('MN', ref.groups.MN, rows(k, (i) => ({ measure: 'raw_mean', mean: g.m1[i], sd: g.sd1[i], n: g.n1[i] })), 'raw_mean'),
      compare('OR', ref.groups.OR, counts('log_odds_ratio'), 'log_odds_ratio'),
      compare('OR2DL', ref.groups.OR2DL, counts('smd'), 'g_s'),
    ];
    for (const a of checks) expect(a.errors).toEqual([]);
  });
});
