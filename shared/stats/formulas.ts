/** A formula a screen can show beside a computed effect: its label, the expression in plain text, and the published source. */
export interface FormulaInfo {
  label: string;
  expression: string;
  source: string;
}

const BORENSTEIN = 'Borenstein, Hedges, Higgins & Rothstein (2009). Introduction to Meta-Analysis. Wiley';
const J = 'J = 1 − 3/(4·df − 1)';

export const formulas: Record<string, FormulaInfo> = {
  'smd.ind.means': {
    label: "Hedges' g, independent groups, from means and SDs",
    expression: `d = (m1 − m2)/S_within, S_within = √(((n1−1)s1² + (n2−1)s2²)/(n1+n2−2)); V_d = (n1+n2)/(n1·n2) + d²/(2(n1+n2)); g = J·d, V_g = J²·V_d, ${J}, df = n1+n2−2`,
    source: `${BORENSTEIN}, ch. 4 (eqs. 4.18–4.23)`,
  },
  'smd.ind.t': {
    label: "Hedges' g, independent groups, from t",
    expression: `d = t·√((n1+n2)/(n1·n2)); V_d = (n1+n2)/(n1·n2) + d²/(2(n1+n2)); g = J·d, V_g = J²·V_d, ${J}, df = n1+n2−2`,
    source: `${BORENSTEIN}, ch. 7`,
  },
  'smd.ind.f': {
    label: "Hedges' g, independent groups, from F(1, df)",
    expression: `d = ±√(F·(n1+n2)/(n1·n2)) (sign from the stated direction); V_d = (n1+n2)/(n1·n2) + d²/(2(n1+n2)); g = J·d, ${J}`,
    source: `${BORENSTEIN}, ch. 7`,
  },
  'smd.ind.p': {
    label: "Hedges' g, independent groups, from a two-tailed p",
    expression: `|t| = t⁻¹(1 − p/2; n1+n2−2), sign from the stated direction; d = t·√((n1+n2)/(n1·n2)); g = J·d, ${J}`,
    source: `${BORENSTEIN}, ch. 7`,
  },
  'smd.paired.sd_diff': {
    label: "Hedges' g, within subject, from the SD of the differences and r",
    expression: `S_within = S_diff/√(2(1−r)); d = mean_diff/S_within; V_d = (1/n + d²/(2n))·2(1−r); g = J·d, V_g = J²·V_d, ${J}, df = n−1`,
    source: `${BORENSTEIN}, ch. 4 (eqs. 4.27–4.28); Morris & DeShon (2002), Psychological Methods 7, 105–125`,
  },
  'smd.paired.sds': {
    label: "Hedges' g, within subject, from both condition SDs and r",
    expression: `S_within = √((s1² + s2²)/2); d = (m1 − m2)/S_within; V_d = (1/n + d²/(2n))·2(1−r); g = J·d, V_g = J²·V_d, ${J}, df = n−1`,
    source: `${BORENSTEIN}, ch. 4 (eq. 4.28); Morris & DeShon (2002), Psychological Methods 7, 105–125`,
  },
  'smd.paired.dz_t': {
    label: 'Standardized mean change d_z from a paired t',
    expression: `d_z = t/√n; V = 1/n + d_z²/(2n); g_z = J·d_z, V_g = J²·V, ${J}, df = n−1`,
    source: 'Lakens (2013), Frontiers in Psychology 4:863, eq. 7',
  },
  'lnrom.ind': {
    label: 'Log ratio of means, independent groups',
    expression: 'lnR = ln(m1/m2); V = s1²/(n1·m1²) + s2²/(n2·m2²)',
    source: 'Hedges, Gurevitch & Curtis (1999), Ecology 80, 1150–1156',
  },
  'lnrom.paired': {
    label: 'Log ratio of means, within subject',
    expression: 'lnR = ln(m1/m2); V = s1²/(n·m1²) + s2²/(n·m2²) − 2r·s1·s2/(n·m1·m2)',
    source: 'Lajeunesse (2011), Ecology 92, 2049–2055',
  },
  'lnrom.percent': {
    label: 'Log ratio of means from a percent change',
    expression: 'lnR = ln(1 + p/100); V = (SE_p/100)²/(1 + p/100)² (delta method)',
    source: 'Hedges, Gurevitch & Curtis (1999), Ecology 80, 1150–1156',
  },
  'md.ind.sds': {
    label: 'Raw mean difference, independent groups, from SDs',
    expression: 'D = m1 − m2; V = s1²/n1 + s2²/n2',
    source: `${BORENSTEIN}, ch. 4 (eq. 4.4)`,
  },
  'md.t': {
    label: 'Raw mean difference with SE from t',
    expression: 'SE = D/t; V = SE²',
    source: `${BORENSTEIN}, ch. 4`,
  },
  'md.ci.z': {
    label: 'Raw mean difference with SE from a confidence interval (normal)',
    expression: 'SE = (upper − lower)/(2·z₁₋α/₂); V = SE²',
    source: `${BORENSTEIN}, ch. 4`,
  },
  'md.ci.t': {
    label: 'Raw mean difference with SE from a confidence interval (t on df)',
    expression: 'SE = (upper − lower)/(2·t₁₋α/₂(df)); V = SE²',
    source: `${BORENSTEIN}, ch. 4`,
  },
  'md.paired.sd_diff': {
    label: 'Raw mean difference, within subject, from the SD of the differences',
    expression: 'D = mean of differences; V = S_diff²/n',
    source: `${BORENSTEIN}, ch. 4 (eq. 4.8)`,
  },
  'mean.raw': {
    label: 'Raw mean',
    expression: 'V = s²/n',
    source: `${BORENSTEIN}, ch. 3`,
  },
  fisher_z: {
    label: "Fisher's z from a correlation",
    expression: 'z = ½·ln((1 + r)/(1 − r)); V = 1/(n − 3)',
    source: `${BORENSTEIN}, ch. 6 (eqs. 6.2–6.3)`,
  },
};
