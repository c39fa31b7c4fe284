import type { EffectMetric } from './effect-metrics.js';

/** A formula a screen can show beside a computed effect: its label, the metric it gives, the expression in plain text, the published source, and a note. */
export interface FormulaInfo {
  label: string;
  metric: EffectMetric;
  expression: string;
  source: string;
  note?: string;
}

const BORENSTEIN = 'Borenstein, Hedges, Higgins & Rothstein (2009). Introduction to Meta-Analysis. Wiley';
const HEDGES_1981 = 'Hedges (1981), J. Educational Statistics 6, 107–128 (exact J)';
const HEDGES_OLKIN = 'Hedges & Olkin (1985). Statistical Methods for Meta-Analysis, ch. 5 (variance)';
const MORRIS_DESHON = 'Morris & DeShon (2002), Psychological Methods 7, 105–125';
const BECKER = 'Becker (1988), British J. Mathematical and Statistical Psychology 41, 257–278, eq. 13 (variance)';
const LAKENS = 'Lakens (2013), Frontiers in Psychology 4:863';
const GIBBONS = 'Gibbons, Hedeker & Davis (1993), J. Educational Statistics 18, 271–279 (variance)';
const COUSINEAU = 'Cousineau (2020), The Quantitative Methods for Psychology 16(4) (df and variance); Algina & Keselman (2003), Educational and Psychological Measurement 63, 537–553 (standardizer)';
const WAN = 'Wan, Wang, Liu & Tong (2014), BMC Medical Research Methodology 14:135 (mean and SD from the median)';
const HGC = 'Hedges, Gurevitch & Curtis (1999), Ecology 80, 1150–1156';
const CHINN = 'Chinn (2000), Statistics in Medicine 19, 3127–3131';

const J = (df: string) => `J = Γ(m/2)/(√(m/2)·Γ((m−1)/2)) with m = ${df} (exact)`;
const J_NOTE = 'J is the exact gamma-function form; the common approximation J ≈ 1 − 3/(4m − 1) differs by 1.3% at m = 2 and is not used.';
const WAN_TEXT =
  'a group reported as median m with quartiles q1, q3: mean ≈ (q1 + m + q3)/3, SD ≈ (q3 − q1)/(2Φ⁻¹((0.75n − 0.125)/(n + 0.25))); ' +
  'with min a, max b: mean ≈ (a + 2m + b)/4, SD ≈ (b − a)/(2Φ⁻¹((n − 0.375)/(n + 0.25))); with both: mean ≈ (a + 2q1 + 2m + 2q3 + b)/8, SD ≈ the average of the two SD estimates';
const WAN_NOTE = 'Approximate: the mean and SD are estimated from a median, which assumes roughly normal data.';
const SE_TEXT = 'a group reported with its SE: SD = SE·√n';
const GS_TAIL = `g = J·d, ${J('n1+n2−2')}; V = 1/n1 + 1/n2 + g²/(2(n1+n2))`;
const GRM_TAIL = `g = J·d, ${J('n−1')}; V = 2(1−r)/n + g²/(2n)`;
const GZ_TAIL = `g_z = J·d_z, ${J('n−1')}; V = 1/n + g_z²/(2n)`;
const GZ_NOTE = `${J_NOTE} g_z is standardized by the SD of the differences and is not pooled with g_s, g_av or g_rm; enter the correlation r between conditions to get a raw-score g (g_rm).`;
const LNOR = 'lnOR = ln((a·d)/(b·c)), a, b events and non-events in group 1, c, d in group 2; V = 1/a + 1/b + 1/c + 1/d';
const LNOR_CORRECTED = `${LNOR}, after adding 0.5 to every cell because one cell is 0`;
const LNROM_IND = 'lnR = ln(m1/m2); V = s1²/(n1·m1²) + s2²/(n2·m2²)';
const MD_IND = 'D = m1 − m2; V = s1²/n1 + s2²/n2';

export const formulas: Record<string, FormulaInfo> = {
  'smd.ind.means': {
    label: "Hedges' g (g_s), independent groups, from means and SDs",
    metric: 'g_s',
    expression: `d = (m1 − m2)/S_within, S_within = √(((n1−1)s1² + (n2−1)s2²)/(n1+n2−2)); ${GS_TAIL}`,
    source: `${BORENSTEIN}, ch. 4 (eqs. 4.18–4.19); ${HEDGES_1981}; ${HEDGES_OLKIN}`,
    note: J_NOTE,
  },
  'smd.ind.means.ses': {
    label: "Hedges' g (g_s), independent groups, from means and SEs",
    metric: 'g_s',
    expression: `${SE_TEXT}; d = (m1 − m2)/S_within, S_within = √(((n1−1)s1² + (n2−1)s2²)/(n1+n2−2)); ${GS_TAIL}`,
    source: `${BORENSTEIN}, ch. 4; ${HEDGES_1981}; ${HEDGES_OLKIN}`,
    note: J_NOTE,
  },
  'smd.ind.means.medians': {
    label: "Hedges' g (g_s), independent groups, from medians (approximate)",
    metric: 'g_s',
    expression: `${WAN_TEXT}; then d = (m1 − m2)/S_within; ${GS_TAIL}`,
    source: `${WAN}; ${HEDGES_1981}; ${HEDGES_OLKIN}`,
    note: `${WAN_NOTE} ${J_NOTE}`,
  },
  'smd.ind.t': {
    label: "Hedges' g (g_s), independent groups, from t",
    metric: 'g_s',
    expression: `d = t·√((n1+n2)/(n1·n2)); ${GS_TAIL}`,
    source: `${BORENSTEIN}, ch. 7; ${HEDGES_1981}; ${HEDGES_OLKIN}`,
    note: J_NOTE,
  },
  'smd.ind.f': {
    label: "Hedges' g (g_s), independent groups, from F(1, df)",
    metric: 'g_s',
    expression: `d = ±√(F·(n1+n2)/(n1·n2)) (sign from the stated direction; F = 0 gives d = 0); ${GS_TAIL}`,
    source: `${BORENSTEIN}, ch. 7; ${HEDGES_1981}; ${HEDGES_OLKIN}`,
    note: J_NOTE,
  },
  'smd.ind.p': {
    label: "Hedges' g (g_s), independent groups, from a two-tailed p",
    metric: 'g_s',
    expression: `|t| = t⁻¹(1 − p/2; n1+n2−2), sign from the stated direction (p = 1 gives t = 0); d = t·√((n1+n2)/(n1·n2)); ${GS_TAIL}`,
    source: `${BORENSTEIN}, ch. 7; ${HEDGES_1981}; ${HEDGES_OLKIN}`,
    note: `${J_NOTE} A p reported as a bound (p < .001) is computed at the bound and flagged: the effect is at least this large.`,
  },
  'smd.ind.counts': {
    label: 'Standardized mean difference (g_s scale) from a 2×2 table',
    metric: 'g_s',
    expression: `${LNOR}; d = lnOR·√3/π; V_d = V·3/π²`,
    source: CHINN,
    note: 'Assumes a logistic latent outcome (SD π/√3); no J is applied.',
  },
  'smd.ind.counts.corrected': {
    label: 'Standardized mean difference (g_s scale) from a 2×2 table with a zero cell',
    metric: 'g_s',
    expression: `${LNOR_CORRECTED}; d = lnOR·√3/π; V_d = V·3/π²`,
    source: CHINN,
    note: 'Assumes a logistic latent outcome (SD π/√3); no J is applied.',
  },
  'smd.paired.sd_diff': {
    label: 'Raw-score g (g_rm), within subject, from the SD of the differences and r',
    metric: 'g_rm',
    expression: `S_rm = S_diff/√(2(1−r)); d = mean_diff/S_rm; ${GRM_TAIL}`,
    source: `${MORRIS_DESHON}, eq. 11; ${HEDGES_1981}; ${BECKER}`,
    note: J_NOTE,
  },
  'smd.paired.t_r': {
    label: 'Raw-score g (g_rm), within subject, from a paired t and r',
    metric: 'g_rm',
    expression: `d_z = t/√n; d = d_z·√(2(1−r)); ${GRM_TAIL}`,
    source: `${MORRIS_DESHON}, eq. 11; ${LAKENS}; ${HEDGES_1981}; ${BECKER}`,
    note: J_NOTE,
  },
  'smd.paired.p_r': {
    label: 'Raw-score g (g_rm), within subject, from a two-tailed p of a paired t and r',
    metric: 'g_rm',
    expression: `|t| = t⁻¹(1 − p/2; n−1), sign from the stated direction; d_z = t/√n; d = d_z·√(2(1−r)); ${GRM_TAIL}`,
    source: `${MORRIS_DESHON}, eq. 11; ${HEDGES_1981}; ${BECKER}`,
    note: `${J_NOTE} A p reported as a bound (p < .001) is computed at the bound and flagged.`,
  },
  'smd.paired.sds': {
    label: 'Raw-score g (g_av), within subject, from both condition SDs and r',
    metric: 'g_av',
    expression: `S_av = √((s1² + s2²)/2); d = (m1 − m2)/S_av; g = J·d, ${J('2(n−1)/(1+r²)')}; V = 2(1−r)/n + g²(1+r²)/(4n)`,
    source: `${COUSINEAU}; ${HEDGES_1981}`,
    note: J_NOTE,
  },
  'smd.paired.dz_t': {
    label: 'Standardized mean change g_z from a paired t',
    metric: 'g_z',
    expression: `d_z = t/√n; ${GZ_TAIL}`,
    source: `${LAKENS}, eq. 7; ${HEDGES_1981}; ${GIBBONS}`,
    note: GZ_NOTE,
  },
  'smd.paired.dz_sd_diff': {
    label: 'Standardized mean change g_z from the mean and SD of the differences',
    metric: 'g_z',
    expression: `d_z = mean_diff/S_diff; ${GZ_TAIL}`,
    source: `${LAKENS}, eq. 6; ${HEDGES_1981}; ${GIBBONS}`,
    note: GZ_NOTE,
  },
  'smd.paired.dz_sds': {
    label: 'Standardized mean change g_z from both condition SDs and r',
    metric: 'g_z',
    expression: `S_diff = √(s1² + s2² − 2r·s1·s2); d_z = (m1 − m2)/S_diff; ${GZ_TAIL}`,
    source: `${MORRIS_DESHON}, eq. 12; ${HEDGES_1981}; ${GIBBONS}`,
    note: GZ_NOTE,
  },
  'smd.paired.dz_p': {
    label: 'Standardized mean change g_z from a two-tailed p of a paired t',
    metric: 'g_z',
    expression: `|t| = t⁻¹(1 − p/2; n−1), sign from the stated direction; d_z = t/√n; ${GZ_TAIL}`,
    source: `${LAKENS}, eq. 7; ${HEDGES_1981}; ${GIBBONS}`,
    note: `${GZ_NOTE} A p reported as a bound (p < .001) is computed at the bound and flagged.`,
  },
  'lnrom.ind': {
    label: 'Log ratio of means, independent groups',
    metric: 'log_ratio',
    expression: LNROM_IND,
    source: HGC,
  },
  'lnrom.ind.ses': {
    label: 'Log ratio of means, independent groups, from means and SEs',
    metric: 'log_ratio',
    expression: `${SE_TEXT}; ${LNROM_IND}`,
    source: HGC,
  },
  'lnrom.ind.medians': {
    label: 'Log ratio of means, independent groups, from medians (approximate)',
    metric: 'log_ratio',
    expression: `${WAN_TEXT}; then ${LNROM_IND}`,
    source: `${WAN}; ${HGC}`,
    note: WAN_NOTE,
  },
  'lnrom.paired': {
    label: 'Log ratio of means, within subject',
    metric: 'log_ratio',
    expression: 'lnR = ln(m1/m2); V = s1²/(n·m1²) + s2²/(n·m2²) − 2r·s1·s2/(n·m1·m2)',
    source: 'Lajeunesse (2011), Ecology 92, 2049–2055',
  },
  'lnrom.percent': {
    label: 'Log ratio of means from a percent change and its SE',
    metric: 'log_ratio',
    expression: 'lnR = ln(1 + p/100); V = (SE_p/100)²/(1 + p/100)² (delta method)',
    source: HGC,
  },
  'lnrom.ratio_ci.log': {
    label: 'Log ratio of means from a ratio and its CI (interval symmetric on the log scale)',
    metric: 'log_ratio',
    expression: 'lnR = ln(ratio); SE = (ln U − ln L)/(2·c), c the normal (or t on df) quantile of the level; V = SE²',
    source: HGC,
  },
  'lnrom.ratio_ci.linear': {
    label: 'Log ratio of means from a ratio and its CI (interval symmetric on the ratio scale)',
    metric: 'log_ratio',
    expression: 'lnR = ln(ratio); SE_ratio = (U − L)/(2·c); V = (SE_ratio/ratio)² (delta method)',
    source: HGC,
  },
  'lnrom.percent_ci.log': {
    label: 'Log ratio of means from a percent change and its CI (interval symmetric on the log scale)',
    metric: 'log_ratio',
    expression: 'ratio = 1 + p/100 (the same for the limits); lnR = ln(ratio); SE = (ln U − ln L)/(2·c); V = SE²',
    source: HGC,
  },
  'lnrom.percent_ci.linear': {
    label: 'Log ratio of means from a percent change and its CI (interval symmetric in percent)',
    metric: 'log_ratio',
    expression: 'ratio = 1 + p/100; lnR = ln(ratio); SE_p = (U − L)/(2·c); V = (SE_p/100)²/ratio² (delta method)',
    source: HGC,
  },
  'md.ind.sds': {
    label: 'Raw mean difference, independent groups, from SDs',
    metric: 'mean_diff',
    expression: MD_IND,
    source: `${BORENSTEIN}, ch. 4 (eq. 4.4)`,
  },
  'md.ind.sds.ses': {
    label: 'Raw mean difference, independent groups, from SDs and SEs',
    metric: 'mean_diff',
    expression: `${SE_TEXT}; ${MD_IND}`,
    source: `${BORENSTEIN}, ch. 4 (eq. 4.4)`,
  },
  'md.ind.sds.medians': {
    label: 'Raw mean difference, independent groups, from medians (approximate)',
    metric: 'mean_diff',
    expression: `${WAN_TEXT}; then ${MD_IND}`,
    source: `${WAN}; ${BORENSTEIN}, ch. 4`,
    note: WAN_NOTE,
  },
  'md.ind.ses': {
    label: 'Raw mean difference, independent groups, from means and SEs',
    metric: 'mean_diff',
    expression: 'D = m1 − m2; V = SE1² + SE2²',
    source: `${BORENSTEIN}, ch. 4`,
  },
  'md.se': {
    label: 'Raw mean difference with its SE',
    metric: 'mean_diff',
    expression: 'V = SE²',
    source: `${BORENSTEIN}, ch. 4`,
  },
  'md.t': {
    label: 'Raw mean difference with SE from t',
    metric: 'mean_diff',
    expression: 'SE = D/t; V = SE²',
    source: `${BORENSTEIN}, ch. 4`,
  },
  'md.ci.z': {
    label: 'Raw mean difference with SE from a confidence interval (normal)',
    metric: 'mean_diff',
    expression: 'SE = (upper − lower)/(2·z₁₋α/₂); V = SE²; the interval must be centred on D',
    source: `${BORENSTEIN}, ch. 4`,
  },
  'md.ci.t': {
    label: 'Raw mean difference with SE from a confidence interval (t on df)',
    metric: 'mean_diff',
    expression: 'SE = (upper − lower)/(2·t₁₋α/₂(df)); V = SE²; the interval must be centred on D',
    source: `${BORENSTEIN}, ch. 4`,
  },
  'md.paired.sd_diff': {
    label: 'Raw mean difference, within subject, from the SD of the differences',
    metric: 'mean_diff',
    expression: 'D = mean of differences; V = S_diff²/n',
    source: `${BORENSTEIN}, ch. 4 (eq. 4.8)`,
  },
  'mean.raw': {
    label: 'Raw mean',
    metric: 'raw_mean',
    expression: 'V = s²/n',
    source: `${BORENSTEIN}, ch. 3`,
  },
  'mean.raw.se': {
    label: 'Raw mean with its SE',
    metric: 'raw_mean',
    expression: 'V = SE²',
    source: `${BORENSTEIN}, ch. 3`,
  },
  'mean.raw.median': {
    label: 'Raw mean from a median (approximate)',
    metric: 'raw_mean',
    expression: `${WAN_TEXT}; then V = s²/n`,
    source: WAN,
    note: WAN_NOTE,
  },
  fisher_z: {
    label: "Fisher's z from a correlation",
    metric: 'fisher_z',
    expression: 'z = ½·ln((1 + r)/(1 − r)); V = 1/(n − 3)',
    source: `${BORENSTEIN}, ch. 6 (eqs. 6.2–6.3)`,
  },
  'lnor.counts': {
    label: 'Log odds ratio from a 2×2 table',
    metric: 'log_odds_ratio',
    expression: LNOR,
    source: `Woolf (1955), Annals of Human Genetics 19, 251–253; ${BORENSTEIN}, ch. 5`,
  },
  'lnor.counts.corrected': {
    label: 'Log odds ratio from a 2×2 table with a zero cell',
    metric: 'log_odds_ratio',
    expression: LNOR_CORRECTED,
    source: `Woolf (1955), Annals of Human Genetics 19, 251–253; Haldane (1956), Annals of Human Genetics 20, 309–311`,
  },
};
