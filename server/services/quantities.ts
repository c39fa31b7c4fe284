// Refuses effects whose outcome kind, parameter and unit do not go together, offering the allowed ones.
import type { EffectSheet, Sheet } from '../../shared/schemas/extraction.js';
import { OUTCOMES } from '../../shared/vocabulary/outcomes.js';
import { quantityProblem, type QuantityChoice } from '../../shared/vocabulary/parameters.js';
import { UnprocessableError } from '../lib/errors.js';

/** One refused effect: where it is (`effect`, e.g. "studies.0.effects.1"), the field, why, and the one-click choices. */
export interface QuantityRefusal {
  effect: string;
  path: string;
  field: 'parameter' | 'unit';
  message: string;
  choices: QuantityChoice[];
}

const outcomeLabel = (k: keyof typeof OUTCOMES) => OUTCOMES[k].label;

/** Throws 422 (details.problems, each with its choices) when an effect's parameter or unit is not allowed. */
export function assertQuantities(effects: Array<{ at: string; label: string; effect: EffectSheet }>, prefix: string): void {
  const problems: QuantityRefusal[] = [];
  for (const { at, label, effect } of effects) {
    const p = quantityProblem(effect, outcomeLabel);
    if (p) problems.push({ effect: at, path: `${prefix}${at ? `${at}.` : ''}${p.field}`, field: p.field, message: `${label}: ${p.message}`, choices: p.choices });
  }
  if (!problems.length) return;
  const first = problems[0];
  throw new UnprocessableError(
    `${first.message}. Choose one of: ${first.choices.map((c) => c.label).join('; ')}${problems.length > 1 ? ` (and ${problems.length - 1} more effect${problems.length > 2 ? 's' : ''})` : ''}.`,
    { problems },
  );
}

/** Every effect of a sheet, placed and named for assertQuantities. */
export const sheetEffects = (sheet: Sheet) =>
  sheet.studies.flatMap((s, i) => s.effects.map((effect, j) => ({ at: `studies.${i}.effects.${j}`, label: `Study ${i + 1}, effect ${j + 1}`, effect })));
