import type { StoredEffect, StoredStudy } from '../../../../shared/extraction/stored-sheet';

export type { StoredEffect, StoredStudy };

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
