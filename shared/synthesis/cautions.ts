import type { PoolResult } from '../stats/types.js';
import type { Caution } from './types.js';
import { estimatorI2 } from './analyses.js';

export const NOT_CLINICAL =
  'This is research synthesis, not clinical guidance: for any clinical decision defer to licensed practice and local guidelines.';

/** The field's usual cautions for one result; the last one always applies. */
export function cautionsFor(result: PoolResult, studies: number, [one, many]: [string, string] = ['study', 'studies']): Caution[] {
  const out: Caution[] = [];
  if (studies === 1) out.push({ code: 'single_study', text: 'Only one study matches: the “pooled” value is that study’s own estimate.' });
  if (studies < 5 && result.method !== 'FE' && !result.hksj)
    out.push({
      code: 'few_studies_dl',
      text: `Only ${studies} ${studies === 1 ? one : many}: with fewer than 5 ${many} the usual random-effects interval (DerSimonian–Laird in particular) understates uncertainty; consider the Hartung–Knapp–Sidik–Jonkman adjustment.`,
    });
  if (studies < 10)
    out.push({
      code: 'few_studies_tests',
      text: `Fewer than 10 ${many} (${studies}): asymmetry tests (Egger, Begg, trim-and-fill), subgroup comparisons and meta-regression are unreliable.`,
    });
  const I2 = estimatorI2(result.method, result);
  if (I2 != null && I2 > 75)
    out.push({
      code: 'high_heterogeneity',
      text: `I² is ${I2.toFixed(1)}% (above 75%): the pooled value may describe no real setting; read the prediction interval and look for moderators.`,
    });
  out.push({ code: 'not_clinical', text: NOT_CLINICAL });
  return out;
}
