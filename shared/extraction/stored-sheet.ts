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
