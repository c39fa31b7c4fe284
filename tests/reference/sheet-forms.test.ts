// The extraction sheet's ratio, percent-change and 2×2 forms (computeReported) against R: metafor's escalc()
// gives each log ratio (ROM) or log odds ratio (OR, OR2DL) and its variance; R's qnorm/qt build the interval a
// paper would print, and the sheet must recover escalc's yi and vi from it. Tolerance 1e-9 relative (closed form).
import { beforeAll, describe, expect, it } from 'vitest';
import { computeReported, type ReportForm, type Reported } from '../../shared/extraction/compute.js';
import { Agreement, CLOSED, report, rVector, runRSource } from './r-reference.js';
import { mulberry32 } from '../support/random.js';

type Col = number[];
interface Escalc { yi: Col; vi: Col }
interface Reference {
  rom: Escalc & { df: Col };
  /** the Wald interval of exp(yi) (normal and t on df), a percent change and its interval on the log and on the percent scale */
  ratio: { lo: Col; hi: Col; loT: Col; hiT: Col };
  percent: { p: Col; lo: Col; hi: Col; loLin: Col; hiLin: Col };
  bcg: { a: Col; b: Col; c: Col; d: Col; OR: Escalc; OR2DL: Escalc };
  judgements: { OR: Escalc; OR2DL: Escalc };
}

/** Invented duration-judgement tables: per group, how many said “longer” and “shorter” (some cells 0). */
function judgementTables(seed: number, k: number) {
  const rnd = mulberry32(seed);
  const rows = Array.from({ length: k }, () => {
    const n1 = 6 + Math.floor(rnd() * 50);
    const n2 = 6 + Math.floor(rnd() * 50);
    const a = Math.floor(rnd() * (n1 + 1));
    const c = Math.floor(rnd() * (n2 + 1));
    return { a, b: n1 - a, c, d: n2 - c };
  });
  rows[0] = { a: 0, b: 12, c: 5, d: 9 };
  rows[1] = { a: 14, b: 0, c: 14, d: 0 };
  return { a: rows.map((r) => r.a), b: rows.map((r) => r.b), c: rows.map((r) => r.c), d: rows.map((r) => r.d) };
}

const tables = judgementTables(31, 40);
let ref: Reference;

beforeAll(() => {
  ref = runRSource<Reference>(`
yv <- function(x) list(yi = I(as.numeric(x$yi)), vi = I(as.numeric(x$vi)))
nd <- dat.normand1999
rom <- escalc("ROM", m1i = m1i, sd1i = sd1i, n1i = n1i, m2i = m2i, sd2i = sd2i, n2i = n2i, data = nd)
se <- sqrt(rom$vi); z <- qnorm(0.975); df <- nd$n1i + nd$n2i - 2; tq <- qt(0.975, df)
p <- 100 * (exp(rom$yi) - 1)
bcg <- dat.bcg
j <- list(a = ${rVector(tables.a)}, b = ${rVector(tables.b)}, c = ${rVector(tables.c)}, d = ${rVector(tables.d)})
cat(to_json(list(
  rom = c(yv(rom), list(df = I(df))),
  ratio = list(lo = I(exp(rom$yi - z * se)), hi = I(exp(rom$yi + z * se)), loT = I(exp(rom$yi - tq * se)), hiT = I(exp(rom$yi + tq * se))),
  percent = list(p = I(p), lo = I(100 * (exp(rom$yi - z * se) - 1)), hi = I(100 * (exp(rom$yi + z * se) - 1)),
    loLin = I(p - z * 100 * exp(rom$yi) * se), hiLin = I(p + z * 100 * exp(rom$yi) * se)),
  bcg = list(a = I(bcg$tpos), b = I(bcg$tneg), c = I(bcg$cpos), d = I(bcg$cneg),
    OR = yv(escalc("OR", ai = tpos, bi = tneg, ci = cpos, di = cneg, data = bcg)),
    OR2DL = yv(escalc("OR2DL", ai = tpos, bi = tneg, ci = cpos, di = cneg, data = bcg))),
  judgements = with(j, list(OR = yv(escalc("OR", ai = a, bi = b, ci = c, di = d)), OR2DL = yv(escalc("OR2DL", ai = a, bi = b, ci = c, di = d))))
)))
`);
}, 180_000);

function compare(label: string, expected: Escalc, form: ReportForm, inputs: Reported[], metric: string, formula?: RegExp): string[] {
  const a = new Agreement();
  inputs.forEach((reported, i) => {
    const r = computeReported(form, reported);
    if (r.metric !== metric) a.errors.push(`${label}[${i}]: metric ${r.metric}, expected ${metric}`);
    if (formula && !formula.test(r.formula)) a.errors.push(`${label}[${i}]: formula ${r.formula}`);
    a.check(`${label}[${i}] yi`, r.effect, expected.yi[i], CLOSED);
    a.check(`${label}[${i}] vi`, r.variance, expected.vi[i], CLOSED);
  });
  expect(a.compared).toBe(2 * inputs.length);
  report(`sheet ${label}`, a);
  return a.errors;
}

const each = <T>(k: number, f: (i: number) => T) => Array.from({ length: k }, (_, i) => f(i));

describe('the sheet’s ratio, percent-change and 2×2 forms against R metafor', () => {
  it('a ratio with its 95% CI (normal, and t on df) gives escalc ROM on dat.normand1999 (Normand 1999)', () => {
    const { rom, ratio } = ref;
    const k = rom.yi.length;
    const ratios = each(k, (i) => Math.exp(rom.yi[i]));
    expect(compare('ratio CI', rom, 'ratio_ci', each(k, (i) => ({ ratio: ratios[i], ci_lower: ratio.lo[i], ci_upper: ratio.hi[i] })), 'log_ratio', /^lnrom\.ratio_ci\.log$/)).toEqual([]);
    expect(compare('ratio t CI', rom, 'ratio_ci', each(k, (i) => ({ ratio: ratios[i], ci_lower: ratio.loT[i], ci_upper: ratio.hiT[i], df: rom.df[i] })), 'log_ratio')).toEqual([]);
  });

  it('a percent change with its CI, on the log scale or on the percent scale, gives escalc ROM on dat.normand1999', () => {
    const { rom, percent } = ref;
    const k = rom.yi.length;
    expect(compare('percent CI (log)', rom, 'percent_change', each(k, (i) => ({ percent: percent.p[i], ci_lower: percent.lo[i], ci_upper: percent.hi[i] })), 'log_ratio', /\.log$/)).toEqual([]);
    expect(compare('percent CI (percent)', rom, 'percent_change', each(k, (i) => ({ percent: percent.p[i], ci_lower: percent.loLin[i], ci_upper: percent.hiLin[i] })), 'log_ratio', /\.linear$/)).toEqual([]);
  });

  it('2×2 counts give escalc OR, and OR2DL (Chinn 2000) through the g_s form, on dat.bcg (Colditz et al. 1994)', () => {
    const { bcg } = ref;
    const counts = each(bcg.a.length, (i) => ({ events1: bcg.a[i], nonevents1: bcg.b[i], events2: bcg.c[i], nonevents2: bcg.d[i] }));
    expect(compare('OR bcg', bcg.OR, 'counts_2x2', counts, 'log_odds_ratio')).toEqual([]);
    expect(compare('OR2DL bcg', bcg.OR2DL, 'counts_smd', counts, 'g_s')).toEqual([]);
  });

  it('invented “longer”/“shorter” tables (zero cells: 0.5 added to that table only) give escalc OR and OR2DL', () => {
    const counts = each(tables.a.length, (i) => ({ events1: tables.a[i], nonevents1: tables.b[i], events2: tables.c[i], nonevents2: tables.d[i] }));
    expect(compare('OR judgements', ref.judgements.OR, 'counts_2x2', counts, 'log_odds_ratio')).toEqual([]);
    expect(compare('OR2DL judgements', ref.judgements.OR2DL, 'counts_smd', counts, 'g_s')).toEqual([]);
    expect(computeReported('counts_2x2', counts[0]).n).toBe(26);
  });
});
