import { cohensKappaFromPairs } from './cohens-kappa.js';

/** Two screeners' agreement over records both decided (each a category: "included", "excluded:<reason>"). */
export interface ScreeningAgreement {
  pairs: number;
  agreed: number;
  percentAgreement: number | null;
  kappa: number | null;
  se: number | null;
  caution: string | null;
}

/** Share of records with the same category, and Cohen's κ (shared/agreement/cohens-kappa.ts) over those categories. */
export function screeningAgreement(pairs: ReadonlyArray<readonly [string, string]>): ScreeningAgreement {
  if (!pairs.length) return { pairs: 0, agreed: 0, percentAgreement: null, kappa: null, se: null, caution: 'No record has been settled by two screeners at this stage yet.' };
  const k = cohensKappaFromPairs(pairs);
  const agreed = pairs.filter(([a, b]) => a === b).length;
  const caution =
    k.kappa === null
      ? 'Both screeners used one and the same category throughout, so κ is undefined; the percentage says how often they agreed.'
      : pairs.length < 10 // common practice: a κ from fewer than 10 pairs is read as rough
        ? `κ rests on only ${pairs.length} pair${pairs.length === 1 ? '' : 's'} of decisions; read it as a rough indication.`
        : null;
  return { pairs: pairs.length, agreed, percentAgreement: agreed / pairs.length, kappa: k.kappa, se: k.kappa === null ? null : k.se, caution };
}
