/** Screening decisions and the exclusion reasons a contributor picks from (PRISMA 2020 "excluded with reasons"). */
export const SCREENING_DECISIONS = ['included', 'excluded'] as const;
export type ScreeningDecision = (typeof SCREENING_DECISIONS)[number];

/** PRISMA 2020 items 8 and 16: records are screened on title and abstract, then reports are assessed in full text. */
export const SCREENING_STAGES = ['title_abstract', 'full_text'] as const;
export type ScreeningStage = (typeof SCREENING_STAGES)[number];
export const SCREENING_STAGE_LABELS: Record<ScreeningStage, string> = { title_abstract: 'Title and abstract', full_text: 'Full text' };

/** `awaiting_full_text`: included on title and abstract; `included` means included after the full text (then it may be coded). */
export const SCREENING_STATUSES = ['unscreened', 'awaiting_full_text', 'included', 'excluded'] as const;
export type ScreeningStatus = (typeof SCREENING_STATUSES)[number];

export const EXCLUSION_REASONS = [
  'wrong_population',
  'not_time_perception',
  'no_usable_statistics',
  'review_article',
  'duplicate_publication',
  'full_text_unavailable',
  'other',
] as const;
export type ExclusionReason = (typeof EXCLUSION_REASONS)[number];

/** What a reference is after a decision at a stage. */
export const statusAfter = (stage: ScreeningStage, decision: ScreeningDecision): ScreeningStatus =>
  decision === 'excluded' ? 'excluded' : stage === 'title_abstract' ? 'awaiting_full_text' : 'included';

/** The stage a reference is decided at now: title/abstract until it passes it; an exclusion is changed at its own stage. */
export const stageOf = (status: ScreeningStatus, lastStage: ScreeningStage | null): ScreeningStage =>
  status === 'unscreened' ? 'title_abstract' : status === 'excluded' ? (lastStage ?? 'title_abstract') : 'full_text';

/** The reasons each stage offers. At title and abstract a reason is optional; a full-text exclusion needs one. */
export const STAGE_REASONS: Record<ScreeningStage, readonly ExclusionReason[]> = {
  title_abstract: ['not_time_perception', 'wrong_population', 'review_article', 'duplicate_publication', 'other'],
  full_text: ['no_usable_statistics', 'wrong_population', 'not_time_perception', 'review_article', 'duplicate_publication', 'full_text_unavailable', 'other'],
};

export const EXCLUSION_REASON_LABELS: Record<ExclusionReason, string> = {
  wrong_population: 'Wrong population',
  not_time_perception: 'Not about time perception',
  no_usable_statistics: 'No usable statistics',
  review_article: 'Review article',
  duplicate_publication: 'Duplicate publication',
  full_text_unavailable: 'Full text not available',
  other: 'Other (explained)',
};

/** The count key of title/abstract exclusions made without a reason, and labels for every count key. */
export const NO_REASON = 'no_reason_given';
export const EXCLUSION_COUNT_LABELS: Record<string, string> = { ...EXCLUSION_REASON_LABELS, [NO_REASON]: 'Excluded on title and abstract (no reason given)' };

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
