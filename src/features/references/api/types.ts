export interface ReferenceSummary {
  id: number;
  title: string;
  year: number | null;
  authors: string[];
  firstAuthor: string | null;
  container: string | null;
  doi: string | null;
  source: string;
  screeningStatus: 'unscreened' | 'included' | 'excluded';
  createdAt: string;
}

export interface ScreeningEntry {
  id: number;
  decision: 'included' | 'excluded';
  reason: string | null;
  note: string | null;
  decidedAt: string;
  decidedBy: { id: number; login: string } | null;
}

export interface ReferenceDetail {
  reference: ReferenceSummary & {
    csl: Record<string, unknown>;
    mergedInto: number | null;
    version: number;
    updatedAt: string;
    createdBy: { id: number; login: string } | null;
    abstract: string | null;
  };
  screening: ScreeningEntry[];
  attachments: Array<{ id: number; filename: string; sizeBytes: number; mime: string; createdAt: string; uploadedBy: { id: number; login: string } | null }>;
  duplicates: Array<{ candidateId: number; otherId: number; reason: string }>;
  imports: Array<{ batchId: number; format: string; index: number; status: string; at: string }>;
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}
