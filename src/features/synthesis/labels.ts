import { METRIC_LABELS, OUTCOMES, type OutcomeKind } from '../../../shared/vocabulary/outcomes';
import { POPULATION_LABELS, type Population } from '../../../shared/vocabulary/populations';
import { MODALITY_LABELS, type Modality } from '../../../shared/vocabulary/modalities';
import { TASK_LABELS, type Task } from '../../../shared/vocabulary/tasks';
import { DESIGN_LABELS, type Design } from '../../../shared/vocabulary/designs';
import type { Metric } from '../../../shared/stats/metrics';

/** A vocabulary value in words (falls back to the value itself). */
export function valueLabel(kind: string, value: string): string {
  switch (kind) {
    case 'outcome':
      return OUTCOMES[value as OutcomeKind]?.label ?? value;
    case 'metric':
      return METRIC_LABELS[value as Metric] ?? value;
    case 'population':
      return POPULATION_LABELS[value as Population] ?? value;
    case 'modality':
      return MODALITY_LABELS[value as Modality] ?? value;
    case 'task':
      return TASK_LABELS[value as Task] ?? value;
    case 'design':
      return DESIGN_LABELS[value as Design] ?? value;
    default:
      return value;
  }
}

/** Fixed precision by metric: milliseconds to 1 decimal, standardized metrics to 3. */
export const digitsFor = (metric: string) => (metric === 'raw_mean' || metric === 'mean_diff' ? 1 : 3);
export const fx = (x: number | null | undefined, d: number) => (x == null || !Number.isFinite(x) ? '—' : x.toFixed(d));
export const fp = (p: number | null | undefined) => (p == null || !Number.isFinite(p) ? '—' : p < 0.001 ? '< 0.001' : p.toFixed(3));
