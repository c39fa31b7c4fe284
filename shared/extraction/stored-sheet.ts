import type { EffectSheet, Sheet, StudySheet } from '../schemas/extraction.js';
import type { ReportForm, Reported } from './compute.js';

/** A coded study and its effects as stored and answered by the API (the server's and the sheet's shape). */
export interface StoredEffect {
  id: number;
  label: string;
  outcome?: string;
  manipulation?: string;
  form?: ReportForm;
  reported: Reported;
  assumedR?: number;
  page?: string;
  locator?: string;
  quote?: string;
  version: number;
  /** set when a curator withdrew this settled effect */
  withdrawnReason?: string | null;
  computed: { metric: string; effect: number; variance: number; formula: string; assumedR: number | null; n: number | null } | null;
}

export interface StoredStudy {
  id: number;
  studyId: number | null;
  label: string;
  design?: string;
  n1?: number;
  n2?: number;
  population?: string;
  diagnosis?: string;
  modality?: string;
  task?: string;
  standardMs?: number;
  effects: StoredEffect[];
}

/** A stored sheet back in the sheet shape (for comparison, copying and settling). */
export function toSheet(studies: StoredStudy[], notes = ''): Sheet {
  return {
    notes,
    studies: studies.map((s) => ({
      label: s.label,
      design: s.design as StudySheet['design'],
      n1: s.n1,
      n2: s.n2,
      population: s.population as StudySheet['population'],
      diagnosis: s.diagnosis,
      modality: s.modality as StudySheet['modality'],
      task: s.task as StudySheet['task'],
      standardMs: s.standardMs,
      effects: s.effects.map((e) => ({
        label: e.label,
        outcome: e.outcome as EffectSheet['outcome'],
        manipulation: e.manipulation,
        form: e.form,
        reported: e.reported,
        assumedR: e.assumedR,
        page: e.page,
        locator: e.locator,
        quote: e.quote,
      })),
    })),
  };
}
