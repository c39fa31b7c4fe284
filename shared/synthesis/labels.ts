import { METRIC_LABELS, OUTCOMES, type OutcomeKind } from '../vocabulary/outcomes.js';
import { POPULATION_LABELS, type Population } from '../vocabulary/populations.js';
import { MODALITY_LABELS, type Modality } from '../vocabulary/modalities.js';
import { TASK_LABELS, type Task } from '../vocabulary/tasks.js';
import { DESIGN_LABELS, type Design } from '../vocabulary/designs.js';
import type { Metric } from '../stats/metrics.js';
import { PARAMETER_LABELS, UNIT_LABELS, type Parameter, type Unit } from '../vocabulary/parameters.js';

/** A vocabulary value in words (falls back to the value itself). */
export function valueLabel(kind: string, value: string): string {
  switch (kind) {
    case 'outcome':
      return OUTCOMES[value as OutcomeKind]?.label ?? value;
    case 'metric':
      return METRIC_LABELS[value as Metric] ?? value;
    case 'parameter':
      return PARAMETER_LABELS[value as Parameter] ?? value;
    case 'unit':
      return UNIT_LABELS[value as Unit] ?? value;
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
