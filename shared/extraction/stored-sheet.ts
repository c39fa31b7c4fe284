import type { Sheet, StoredEffect, StoredStudy } from '../schemas/extraction.js';

/** A coded study and its effects as stored and answered by the API: defined once, in shared/schemas/extraction.ts. */
export type { StoredEffect, StoredStudy };

/** A stored sheet back in the sheet shape (for comparison, copying and settling). */
export function toSheet(studies: StoredStudy[], notes = ''): Sheet {
  return {
    notes,
    studies: studies.map((s) => ({
      label: s.label,
      design: s.design,
      n1: s.n1,
      n2: s.n2,
      population: s.population,
      diagnosis: s.diagnosis,
      modality: s.modality,
      task: s.task,
      standardMs: s.standardMs,
      effects: s.effects.map((e) => ({
        label: e.label,
        outcome: e.outcome,
        manipulation: e.manipulation,
        parameter: e.parameter,
        unit: e.unit,
        form: e.form,
        reported: e.reported,
        assumedR: e.assumedR,
        page: e.page,
        locator: e.locator,
        quote: e.quote,
        derivation: e.derivation,
      })),
    })),
  };
}
