import type { ReportForm, Reported } from '../../../../shared/extraction/compute';

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

export interface ExtractionDetail {
  extraction: {
    id: number;
    kind: 'coding' | 'settled';
    state: string;
    version: number;
    recordVersion: number | null;
    assignmentId: number | null;
    referenceId: number;
    reference: { id: number; title: string; label: string; doi: string | null; year: number | null };
    coder: string | null;
    updatedBy: string | null;
    updatedAt: string;
    submittedAt: string | null;
    settledAt: string | null;
    supersedesId: number | null;
    supersededBy: number | null;
    reopenReason: string | null;
    notes: string;
    editable: boolean;
  };
  studies: StoredStudy[];
}
