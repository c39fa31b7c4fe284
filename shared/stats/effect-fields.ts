import { StatsInputError } from './errors.js';

/** The input forms computeEffect knows; each takes the fields listed in EFFECT_FIELDS. */
export const EFFECT_MEASURES = [
  'smd', 'smd_paired', 'd_z', 'log_ratio', 'log_ratio_paired', 'mean_diff', 'raw_mean', 'fisher_z', 'log_odds_ratio',
] as const;
export type EffectMeasure = (typeof EFFECT_MEASURES)[number];

const group = <S extends string>(s: S) =>
  [`mean${s}`, `sd${s}`, `se${s}`, `n${s}`, `median${s}`, `lower_quartile${s}`, `upper_quartile${s}`, `min${s}`, `max${s}`] as const;
const PAIRED = ['mean_diff', 'sd_diff', 'n', 'r', 'mean1', 'sd1', 'mean2', 'sd2', 't', 'p', 'p_less_than', 'direction'] as const;
const COUNTS = ['events1', 'nonevents1', 'events2', 'nonevents2'] as const;

/**
 * The numeric fields each measure reads (every one optional; computeEffect picks the alternative from which are
 * present). `direction` is 1 (group or condition 1 higher) or −1; `p_less_than` is a reported bound (p < .001 → 0.001).
 */
export const EFFECT_FIELDS = {
  smd: [...group('1'), ...group('2'), 't', 'F', 'p', 'p_less_than', 'direction', ...COUNTS],
  smd_paired: PAIRED,
  d_z: PAIRED,
  log_ratio: [...group('1'), ...group('2'), 'ratio', 'percent', 'se', 'ci_lower', 'ci_upper', 'level', 'df'],
  log_ratio_paired: ['mean1', 'sd1', 'mean2', 'sd2', 'n', 'r'],
  mean_diff: [...group('1'), ...group('2'), 'mean_diff', 'se', 'sd_diff', 'n', 't', 'ci_lower', 'ci_upper', 'level', 'df'],
  raw_mean: group(''),
  fisher_z: ['r', 'n'],
  log_odds_ratio: [...COUNTS, 'n1', 'n2'],
} as const satisfies Record<EffectMeasure, readonly string[]>;

export type EffectField = (typeof EFFECT_FIELDS)[EffectMeasure][number];

/** What computeEffect takes: a measure and some of its fields. */
export type EffectInput = { measure: EffectMeasure } & Partial<Record<EffectField, number>>;

/**
 * Reads an effect request without a schema library: an object with a known `measure` and, for each field that
 * measure reads, a finite number (`direction` 1 or −1). Fields the measure does not read are ignored. Throws
 * StatsInputError naming the field.
 */
export function readEffectInput(input: unknown): { measure: EffectMeasure; values: Partial<Record<EffectField, number>> } {
  if (input === null || typeof input !== 'object' || Array.isArray(input))
    throw new StatsInputError('the effect request must be an object with a measure and the reported values');
  const o = input as Record<string, unknown>;
  const measure = o.measure;
  if (typeof measure !== 'string' || !(EFFECT_MEASURES as readonly string[]).includes(measure))
    throw new StatsInputError(`measure must be one of ${EFFECT_MEASURES.join(', ')} (got ${JSON.stringify(measure) ?? 'nothing'})`, 'measure');
  const values: Partial<Record<EffectField, number>> = {};
  for (const field of EFFECT_FIELDS[measure as EffectMeasure] as readonly EffectField[]) {
    const x = o[field];
    if (x === undefined) continue;
    if (typeof x !== 'number' || !Number.isFinite(x)) throw new StatsInputError(`${field} must be a finite number (got ${JSON.stringify(x)})`, field);
    if (field === 'direction' && x !== 1 && x !== -1) throw new StatsInputError('direction must be 1 (group 1 higher) or -1 (group 1 lower)', field);
    values[field] = x;
  }
  return { measure: measure as EffectMeasure, values };
}
