// The reference answers, defined once in shared/schemas/references.ts.
export type { ReferenceDetail, ReferenceSummary, ScreeningEntry } from '../../../../shared/schemas/references';
export type { Page } from '../../../../shared/schemas/common';
