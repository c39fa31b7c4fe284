// The coding-sheet answers, defined once in shared/schemas/extraction.ts.
export type { ExtractionDetail, StoredEffect, StoredStudy } from '../../../../shared/schemas/extraction';
