/** Screening decisions and the exclusion reasons a contributor picks from (PRISMA 2020 "excluded with reasons"). */
export const SCREENING_DECISIONS = ['included', 'excluded'] as const;
export type ScreeningDecision = (typeof SCREENING_DECISIONS)[number];

export const SCREENING_STATUSES = ['unscreened', 'included', 'excluded'] as const;
export type ScreeningStatus = (typeof SCREENING_STATUSES)[number];

export const EXCLUSION_REASONS = [
  'wrong_population',
  'not_time_perception',
  'no_usable_statistics',
  'review_article',
  'duplicate_publication',
  'other',
] as const;
export type ExclusionReason = (typeof EXCLUSION_REASONS)[number];

export const EXCLUSION_REASON_LABELS: Record<ExclusionReason, string> = {
  wrong_population: 'Wrong population',
  not_time_perception: 'Not about time perception',
  no_usable_statistics: 'No usable statistics',
  review_article: 'Review article',
  duplicate_publication: 'Duplicate publication',
  other: 'Other (explained)',
};

/** Where a reference came from (refs.source), in words for the flow diagram and exports. */
export const REFERENCE_SOURCE_LABELS: Record<string, string> = {
  bibtex: 'BibTeX import',
  ris: 'RIS import',
  doi: 'DOI look-up',
  manual: 'Entered by hand',
  seed: 'Demo registry',
  'csl-json': 'CSL-JSON import',
};
export const referenceSourceLabel = (source: string) => REFERENCE_SOURCE_LABELS[source] ?? source;
