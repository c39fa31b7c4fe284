import { StatsInputError } from './errors.js';
import { prepareData } from './validate-input.js';
import type { NumericArray } from './types.js';

export interface AggregateInput {
  effects: NumericArray;
  variances: NumericArray;
  /** the study each effect comes from */
  studies: ArrayLike<string | number>;
  /** the assumed correlation between effects from the same study, stated by the analyst */
  r: number;
  /** metafor's inverse-variance composite (aggregate.escalc, struct = "CS", weighted = TRUE) instead of the mean */
  weighted?: boolean;
}

export interface AggregateResult {
  studies: (string | number)[];
  effects: number[];
  variances: number[];
  /** how many effects each study contributed */
  counts: number[];
  r: number;
}

/**
 * Combines several effects from one study into one (Borenstein et al. 2009, ch. 24): the mean
 * ȳ = (1/m)Σyᵢ with variance (1/m)²(Σvᵢ + Σᵢ≠ⱼ r·√(vᵢvⱼ)), r the stated correlation between the
 * study's effects (r = 1 when they measure the same thing on the same people, 0 for independent
 * subgroups). Studies keep the order of first appearance. Input: −1 ≤ r ≤ 1.
 * weighted: the generalised-least-squares composite under the same compound-symmetric covariance V
 * (V_ii = v_i, V_ij = r·√(v_iv_j)): ȳ = 1ᵀV⁻¹y / 1ᵀV⁻¹1 with variance 1/1ᵀV⁻¹1, as metafor's aggregate.escalc
 * with weighted = TRUE. With s_i = 1/√v_i, V⁻¹ = D⁻¹R⁻¹D⁻¹ and R⁻¹ = (I − r/(1 + (m − 1)r)·11ᵀ)/(1 − r) give
 * 1ᵀV⁻¹a = (Σs_i²a_i − c·Σs_i·Σs_ia_i)/(1 − r), c = r/(1 + (m − 1)r); needs r < 1.
 * Example: aggregateWithinStudy({ effects: [0.4, 0.6], variances: [0.04, 0.04], studies: ['s', 's'], r: 0.5 }) → effect 0.5, variance 0.03.
 */
export function aggregateWithinStudy(input: AggregateInput): AggregateResult {
  if (input === null || typeof input !== 'object') throw new StatsInputError('input must be an object');
  const { y, v } = prepareData(input.effects, input.variances);
  const r = input.r;
  if (typeof r !== 'number' || !(r >= -1 && r <= 1)) throw new StatsInputError('r must be a correlation between -1 and 1', 'r');
  const weighted = input.weighted === true;
  if (input.weighted !== undefined && typeof input.weighted !== 'boolean') throw new StatsInputError('weighted must be true or false', 'weighted');
  if (weighted && !(r < 1)) throw new StatsInputError('the inverse-variance (weighted) composite needs r < 1: at r = 1 the effects of a study are one value', 'r');
  const s = input.studies as ArrayLike<unknown>;
  if (!s || typeof s !== 'object' || s.length !== y.length)
    throw new StatsInputError(`studies must have one id per effect (${y.length})`, 'studies');
  const members = new Map<string | number, number[]>();
  for (let i = 0; i < y.length; i++) {
    const id = s[i];
    if (typeof id !== 'string' && typeof id !== 'number') throw new StatsInputError(`studies[${i}] must be a string or number`, 'studies');
    if (!members.has(id)) members.set(id, []);
    members.get(id)!.push(i);
  }
  const out: AggregateResult = { studies: [], effects: [], variances: [], counts: [], r };
  for (const [id, idx] of members) {
    const m = idx.length;
    if (weighted && m > 1) {
      const c = r / (1 + (m - 1) * r);
      let s1 = 0, s2 = 0, s2y = 0, s1y = 0;
      for (const i of idx) {
        const si = 1 / Math.sqrt(v[i]);
        s1 += si;
        s2 += si * si;
        s1y += si * y[i];
        s2y += si * si * y[i];
      }
      const precision = (s2 - c * s1 * s1) / (1 - r);
      if (!(precision > 0)) throw new StatsInputError(`study ${JSON.stringify(id)}: r = ${r} gives a non-positive combined variance`, 'r');
      out.studies.push(id);
      out.effects.push((s2y - c * s1 * s1y) / (1 - r) / precision);
      out.variances.push(1 / precision);
      out.counts.push(m);
      continue;
    }
    let sy = 0;
    let sv = 0;
    let sqrtSum = 0;
    for (const i of idx) {
      sy += y[i];
      sv += v[i];
      sqrtSum += Math.sqrt(v[i]);
    }
    // Σᵢ≠ⱼ √(vᵢvⱼ) = (Σ√vᵢ)² − Σvᵢ
    const variance = (sv + r * (sqrtSum * sqrtSum - sv)) / (m * m);
    if (!(variance > 0)) throw new StatsInputError(`study ${JSON.stringify(id)}: r = ${r} gives a non-positive combined variance`, 'r');
    out.studies.push(id);
    out.effects.push(sy / m);
    out.variances.push(variance);
    out.counts.push(m);
  }
  return out;
}
