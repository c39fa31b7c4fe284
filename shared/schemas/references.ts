import { z } from 'zod';
import { OUTCOME_KINDS } from '../vocabulary/outcomes.js';
import { TASKS } from '../vocabulary/tasks.js';
import { EXCLUSION_REASONS, SCREENING_DECISIONS, SCREENING_STAGES, SCREENING_STATUSES } from '../vocabulary/screening.js';
import { idParam, actorSchema, pageSchema, pagingSchema, timestamp } from './common.js';

export const IMPORT_FORMATS = ['bibtex', 'ris', 'doi'] as const;
export type ImportFormat = (typeof IMPORT_FORMATS)[number];

/** A DOI as the registry keeps it: lower case, no resolver prefix. */
export const DOI_PATTERN = /^10\.\d{4,9}\/\S+$/;

export const importRequestSchema = z.object({
  format: z.enum(IMPORT_FORMATS, { message: 'format must be bibtex, ris or doi' }),
  text: z.string().min(1, 'paste at least one entry').max(20_000_000, 'the text is larger than 20 MB'),
  label: z.string().trim().max(200).optional(),
});
export type ImportRequest = z.infer<typeof importRequestSchema>;

/** From this many entries (a rough count) or characters, a BibTeX/RIS import runs as a job and answers 202 at once. */
export const IMPORT_JOB_THRESHOLD = { entries: 2000, chars: 5_000_000 } as const;

/** The longest a reference's fields may be, at edit and at import alike. */
export const REFERENCE_LIMITS = { title: 1000, container: 500, abstract: 20_000, authors: 500, name: 200, doi: 300 } as const;

export const ENTRY_STATUSES = ['pending', 'imported', 'duplicate', 'rejected'] as const;
export type EntryStatus = (typeof ENTRY_STATUSES)[number];

export const importEntryViewSchema = z.object({
  index: z.number().int(),
  status: z.enum(ENTRY_STATUSES),
  message: z.string().optional(),
  referenceId: z.number().int().optional(),
  key: z.string().optional(),
  likelyDuplicateOf: z.number().int().optional(),
});
export type ImportEntryView = z.infer<typeof importEntryViewSchema>;

/**
 * queued: a large BibTeX/RIS import waits for its job; running: the job reads it (or DOIs are looked up);
 * done; failed: the job stopped (`failure` says why; what it had imported stays).
 */
export const IMPORT_STATES = ['queued', 'running', 'done', 'failed'] as const;
export type ImportState = (typeof IMPORT_STATES)[number];

export const importBatchViewSchema = z.object({
  id: z.number().int(),
  format: z.enum(IMPORT_FORMATS),
  label: z.string().nullable(),
  state: z.enum(IMPORT_STATES),
  /** Entries in the batch (for a queued import, as counted before reading). */
  total: z.number().int(),
  /** Entries read or looked up so far. */
  processed: z.number().int(),
  /** Why a job failed, in words (and how far it got); null otherwise. */
  failure: z.string().nullable(),
  counts: z.object({ imported: z.number().int(), duplicate: z.number().int(), rejected: z.number().int(), pending: z.number().int() }),
  createdAt: timestamp,
  finishedAt: timestamp.nullable(),
  createdBy: actorSchema.nullable(),
});
export type ImportBatchView = z.infer<typeof importBatchViewSchema>;

/** POST /api/imports and GET /api/imports/:id */
export const importResultSchema = z.object({
  batch: importBatchViewSchema,
  entries: z.array(importEntryViewSchema),
  /** How many entries match (all of them, or those of the requested status). */
  entriesTotal: z.number().int(),
  /** Pending DOI look-ups whose last attempt found the resolver unreachable (they are retried). */
  resolverUnreachable: z.number().int(),
  /** On a 202 answer: where to read the batch's progress (GET). */
  statusUrl: z.string().optional(),
});
export type ImportResult = z.infer<typeof importResultSchema>;
export const importPageSchema = pageSchema(importBatchViewSchema);
export type ImportPage = z.infer<typeof importPageSchema>;

export const importListQuerySchema = pagingSchema(['created_at', 'format', 'total'] as const, 'created_at', { order: 'desc' });

/** Optional paging of a batch's entries (the screen); without it GET /api/imports/:id returns them all. */
export const importEntriesQuerySchema = z.object({
  entryPage: z.coerce.number().int().min(1).optional(),
  entryPageSize: z.coerce.number().int().min(1).max(500).default(100),
  entryStatus: z.enum(ENTRY_STATUSES).optional(),
});

export const REFERENCE_SORTS = ['title', 'year', 'first_author', 'container', 'created_at', 'screening_status'] as const;
export const referenceListQuerySchema = pagingSchema(REFERENCE_SORTS, 'created_at').extend({
  q: z.string().trim().max(200).optional(),
  status: z.enum(SCREENING_STATUSES).optional(),
  source: z.string().trim().max(40).optional(),
  yearFrom: z.coerce.number().int().min(1000).max(3000).optional(),
  yearTo: z.coerce.number().int().min(1000).max(3000).optional(),
  batch: idParam.optional(),
});
export type ReferenceListQuery = z.infer<typeof referenceListQuerySchema>;

const L = REFERENCE_LIMITS;
const personSchema = z.object({
  family: z.string().trim().min(1, 'family name is required').max(L.name),
  given: z.string().trim().max(L.name).optional(),
});

/** The fields a contributor may edit on a reference; the rest of the CSL-JSON is kept as imported. */
export const referenceEditSchema = z.object({
  version: z.number().int().positive({ message: 'send the version you edited' }),
  title: z.string().trim().min(1, 'a reference needs a title').max(L.title).optional(),
  year: z.number().int().min(1000, 'year must be four digits').max(3000, 'year must be four digits').nullable().optional(),
  authors: z.array(personSchema).max(L.authors).optional(),
  container: z.string().trim().max(L.container).nullable().optional(),
  doi: z
    .string()
    .trim()
    .max(L.doi)
    .transform((s) => normaliseDoi(s) ?? s)
    .refine((s) => s === '' || DOI_PATTERN.test(s), 'a DOI looks like 10.5555/abc')
    .nullable()
    .optional(),
  abstract: z.string().max(L.abstract).nullable().optional(),
});
export type ReferenceEdit = z.infer<typeof referenceEditSchema>;

const stageField = z.enum(SCREENING_STAGES, { message: 'stage must be title_abstract or full_text' });
const decisionFields = z.object({
  decision: z.enum(SCREENING_DECISIONS, { message: 'decision must be included or excluded' }),
  reason: z.enum(EXCLUSION_REASONS, { message: 'pick a reason from the list' }).optional(),
  note: z.string().trim().max(2000).optional(),
  /** The stage the screener decided at (the reference's current one; another answers 409). Which reasons a stage takes, and that a full-text exclusion needs one, the server checks (422). */
  stage: stageField.optional(),
});
const decisionRules = (v: z.infer<typeof decisionFields>, ctx: z.RefinementCtx) => {
  if (v.decision === 'included' && v.reason) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'an inclusion takes no exclusion reason' });
  if (v.reason === 'other' && !v.note) ctx.addIssue({ code: 'custom', path: ['note'], message: 'say why, when the reason is "other"' });
};
/** A decision's own fields (a form checks these; the request adds the version). */
export const screeningDecisionFieldsSchema = decisionFields.superRefine(decisionRules);
export const screeningDecisionSchema = decisionFields
  .extend({
    /** The reference's version the screener saw (a decision made on an old one answers 409). */
    version: z.number({ message: 'send the reference version you saw' }).int().positive(),
  })
  .superRefine(decisionRules);
export type ScreeningDecisionInput = z.infer<typeof screeningDecisionSchema>;

export const screeningQueueQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(100).default(20),
  stage: stageField.default('title_abstract'),
  batch: idParam.optional(),
});

export const duplicateListQuerySchema = pagingSchema(['created_at', 'year'] as const, 'created_at').extend({
  status: z.enum(['open', 'merged', 'dismissed']).default('open'),
});
export const mergeSchema = z.object({ keep: idParam.optional() });

export const searchQuerySchema = z.object({
  q: z.string().trim().max(200).default(''),
  yearFrom: z.coerce.number().int().min(1000).max(3000).optional(),
  yearTo: z.coerce.number().int().min(1000).max(3000).optional(),
  status: z.enum(SCREENING_STATUSES).optional(),
  /** references whose settled effects cover this manipulation (its term), outcome kind and task */
  manipulation: z.string().trim().regex(/^[a-z0-9_]{1,80}$/, 'name the manipulation by its term from the vocabulary, e.g. luminance').optional(),
  outcome: z.enum(OUTCOME_KINDS, { message: 'choose an outcome kind from the list' }).optional(),
  task: z.enum(TASKS, { message: 'choose a task from the list' }).optional(),
  limit: z.coerce.number().int().min(1).max(100).default(20),
  offset: z.coerce.number().int().min(0).max(10_000).default(0),
});
export type SearchQuery = z.infer<typeof searchQuerySchema>;


export const exportQuerySchema = z.object({
  format: z.enum(['bibtex', 'csl-json']),
  ids: z
    .string()
    .regex(/^\d+(,\d+)*$/, 'ids is a comma-separated list of reference ids')
    .transform((s): unknown[] => s.split(','))
    .pipe(z.array(idParam).max(5000, 'export at most 5,000 references at a time')),
});

/** "https://doi.org/10.5555/X", "doi:10.5555/x" → "10.5555/x"; anything else → null. */
export function normaliseDoi(raw: string | null | undefined): string | null {
  if (!raw) return null;
  const s = raw
    .trim()
    .replace(/^https?:\/\/(dx\.)?doi\.org\//i, '')
    .replace(/^doi:\s*/i, '')
    .trim()
    .toLowerCase();
  return DOI_PATTERN.test(s) ? s : null;
}

// ---- answers about references

export const referenceSummarySchema = z.object({
  id: z.number().int(),
  title: z.string(),
  year: z.number().int().nullable(),
  authors: z.array(z.string()),
  firstAuthor: z.string().nullable(),
  container: z.string().nullable(),
  doi: z.string().nullable(),
  source: z.string(),
  screeningStatus: z.enum(SCREENING_STATUSES),
  createdAt: timestamp,
});
export type ReferenceSummary = z.infer<typeof referenceSummarySchema>;
export const referencePageSchema = pageSchema(referenceSummarySchema);
export type ReferencePage = z.infer<typeof referencePageSchema>;

export const screeningEntrySchema = z.object({
  id: z.number().int(),
  stage: z.enum(SCREENING_STAGES),
  decision: z.enum(SCREENING_DECISIONS),
  reason: z.string().nullable(),
  note: z.string().nullable(),
  decidedAt: timestamp,
  decidedBy: actorSchema.nullable(),
  refId: z.number().int(),
});
export type ScreeningEntry = z.infer<typeof screeningEntrySchema>;

export const attachmentSchema = z.object({
  id: z.number().int(),
  filename: z.string(),
  sizeBytes: z.number().int(),
  mime: z.string(),
  createdAt: timestamp,
  uploadedBy: actorSchema.nullable(),
});
export type Attachment = z.infer<typeof attachmentSchema>;

/** GET /api/references/:id */
export const referenceDetailSchema = z.object({
  reference: referenceSummarySchema.extend({
    csl: z.record(z.string(), z.unknown()),
    mergedInto: z.number().int().nullable(),
    version: z.number().int(),
    updatedAt: timestamp,
    createdBy: actorSchema.nullable(),
    abstract: z.string().nullable(),
    /** Effects of this reference in the settled registry (excluding it then needs a curator). */
    settledEffects: z.number().int(),
  }),
  screening: z.array(screeningEntrySchema),
  attachments: z.array(attachmentSchema),
  duplicates: z.array(z.object({ candidateId: z.number().int(), otherId: z.number().int(), reason: z.string() })),
  imports: z.array(z.object({ batchId: z.number().int(), format: z.string(), index: z.number().int(), status: z.enum(ENTRY_STATUSES), at: timestamp })),
});
export type ReferenceDetail = z.infer<typeof referenceDetailSchema>;

/** PATCH /api/references/:id */
export const referenceEditResultSchema = z.object({ id: z.number().int(), version: z.number().int(), changed: z.array(z.string()) });
export type ReferenceEditResult = z.infer<typeof referenceEditResultSchema>;

/** POST /api/references/:id/screening */
export const screeningResultSchema = screeningEntrySchema.omit({ decidedBy: true }).extend({
  screeningStatus: z.enum(SCREENING_STATUSES),
  /** The reference's new version. */
  version: z.number().int(),
  /** Settled records a curator's exclusion withdrew (their effects leave every analysis), and the registry version it made. */
  withdrawnRecords: z.array(z.number().int()),
  registryVersion: z.number().int().nullable(),
  /**
   * Under the two-screener rule: how many screeners' decisions the record has at this stage now, and whether it is
   * settled (two that agree, or a curator's settlement). null under the one-screener rule.
   */
  dual: z.object({ decisionsIn: z.number().int(), settled: z.boolean() }).nullable(),
});
export type ScreeningResult = z.infer<typeof screeningResultSchema>;

/** POST /api/references/:id/screening/undo: the reference version the screener saw. */
export const screeningUndoSchema = z.object({
  version: z.number({ message: 'send the reference version you saw' }).int().positive(),
});
export type ScreeningUndoInput = z.infer<typeof screeningUndoSchema>;
export const screeningUndoResultSchema = z.object({
  refId: z.number().int(),
  /** The decision taken back. */
  undone: z.object({ id: z.number().int(), stage: z.enum(SCREENING_STAGES), decision: z.enum(SCREENING_DECISIONS), reason: z.string().nullable() }),
  /** What the reference is now: the decision before it, or unscreened. */
  screeningStatus: z.enum(SCREENING_STATUSES),
  version: z.number().int(),
  /** The settled records the undone exclusion had withdrawn, settled again. */
  restoredRecords: z.array(z.number().int()),
  /** The registry version after restoring them (null when nothing was restored). */
  registryVersion: z.number().int().nullable(),
});
export type ScreeningUndoResult = z.infer<typeof screeningUndoResultSchema>;

const batchItemsSchema = z
  .array(z.object({ refId: idParam, version: z.number({ message: 'send the reference version you saw' }).int().positive() }), { message: 'send the references as a list' })
  .min(1, 'choose at least one reference')
  .max(100, 'decide at most 100 references at once')
  .refine((items) => new Set(items.map((i) => i.refId)).size === items.length, 'each reference once');

/** POST /api/screening/decisions: one decision for several references, each with the version its screener saw. */
export const screeningBatchDecisionSchema = decisionFields.extend({ items: batchItemsSchema }).superRefine(decisionRules);
export type ScreeningBatchDecisionInput = z.infer<typeof screeningBatchDecisionSchema>;
export const screeningBatchResultSchema = z.object({ results: z.array(screeningResultSchema) });
export type ScreeningBatchResult = z.infer<typeof screeningBatchResultSchema>;

/** POST /api/screening/decisions/undo: takes back the latest decision of each reference, all or none. */
export const screeningBatchUndoSchema = z.object({ items: batchItemsSchema });
export type ScreeningBatchUndoInput = z.infer<typeof screeningBatchUndoSchema>;
export const screeningBatchUndoResultSchema = z.object({ results: z.array(screeningUndoResultSchema) });
export type ScreeningBatchUndoResult = z.infer<typeof screeningBatchUndoResultSchema>;

/** GET /api/screening/queue */
/**
 * Why a reference is in the queue: new (with the import batch that created it, null when it came another way), or,
 * in the full-text queue, included on title and abstract.
 */
/**
 * Under the two-screener rule also: `second_screener_needed` (another screener has decided it) and, on a curator's
 * queue, `conflict` (both screeners decided and disagree; a curator settles it).
 */
export const QUEUE_REASON_KINDS = ['new', 'passed_title_abstract', 'second_screener_needed', 'conflict'] as const;
export const queueReasonSchema = z.object({ kind: z.enum(QUEUE_REASON_KINDS), batch: z.number().int().nullable() });
export const screeningQueueSchema = z.object({
  stage: z.enum(SCREENING_STAGES),
  items: z.array(
    referenceSummarySchema.extend({
      abstract: z.string().nullable(),
      version: z.number().int(),
      keywords: z.array(z.string()),
      attachments: z.array(attachmentSchema.pick({ id: true, filename: true, sizeBytes: true, mime: true })),
      why: queueReasonSchema,
    }),
  ),
  remaining: z.number().int(),
});
export type ScreeningQueue = z.infer<typeof screeningQueueSchema>;
export type ScreeningQueueItem = ScreeningQueue['items'][number];

/** GET /api/screening/counts: the PRISMA 2020 flow numbers. */
const stageCountsSchema = z.object({
  /** Records (title/abstract) or reports (full text) decided at this stage, and those waiting for it. */
  decided: z.number().int(),
  waiting: z.number().int(),
  included: z.number().int(),
  excluded: z.number().int(),
  /** Exclusions by reason; at title/abstract those without one count under `none`. */
  excludedByReason: z.record(z.string(), z.number().int()),
});
export type StageCounts = z.infer<typeof stageCountsSchema>;
export const prismaCountsSchema = z.object({
  /** PRISMA 2020 item 8: title/abstract, then full text. The totals below are over both (screened = decided at every stage it reached). */
  stages: z.object({ title_abstract: stageCountsSchema, full_text: stageCountsSchema }),
  identified: z.object({ total: z.number().int(), bySource: z.record(z.string(), z.number().int()) }),
  duplicatesRemoved: z.object({ total: z.number().int(), importDuplicates: z.number().int(), merged: z.number().int() }),
  afterDuplicates: z.number().int(),
  screened: z.number().int(),
  awaitingScreening: z.number().int(),
  excluded: z.object({ total: z.number().int(), byReason: z.record(z.string(), z.number().int()) }),
  included: z.number().int(),
});
export type PrismaFlow = z.infer<typeof prismaCountsSchema>;

const candidateSideSchema = referenceSummarySchema.extend({ richness: z.number(), mergedInto: z.number().int().nullable(), fields: z.number().int() });
export const duplicateCandidateSchema = z.object({
  id: z.number().int(),
  reason: z.string(),
  status: z.enum(['open', 'merged', 'dismissed']),
  createdAt: timestamp,
  decidedAt: timestamp.nullable(),
  decidedBy: actorSchema.nullable(),
  keptRef: z.number().int().nullable(),
  a: candidateSideSchema,
  b: candidateSideSchema,
});
export type DuplicateCandidate = z.infer<typeof duplicateCandidateSchema>;
export const duplicatePageSchema = pageSchema(duplicateCandidateSchema);
export type DuplicatePage = z.infer<typeof duplicatePageSchema>;

/** POST /api/references/merge and /api/duplicates/:id/merge */
export const mergeResultSchema = z.object({ kept: z.number().int(), merged: z.number().int(), moved: z.record(z.string(), z.number().int()) });
export type MergeResult = z.infer<typeof mergeResultSchema>;
export const dismissResultSchema = z.object({ id: z.number().int(), status: z.literal('dismissed') });
export type DismissResult = z.infer<typeof dismissResultSchema>;
/** POST /api/references/:id/attachments */
export const attachmentCreatedSchema = attachmentSchema.omit({ uploadedBy: true });
export type AttachmentCreated = z.infer<typeof attachmentCreatedSchema>;

export const searchHitSchema = referenceSummarySchema.pick({ id: true, title: true, year: true, authors: true, doi: true, container: true }).extend({
  screeningStatus: z.string(),
  /** what its settled effects cover (empty before a record is settled): for the atlas and record links */
  manipulations: z.array(z.object({ term: z.string(), label: z.string() })),
  outcomes: z.array(z.string()),
  tasks: z.array(z.string()),
  records: z.array(z.number().int()),
});
export type SearchHit = z.infer<typeof searchHitSchema>;
export const searchResultSchema = z.object({
  hits: z.array(searchHitSchema),
  total: z.number().int(),
  facets: z.object({ screening_status: z.record(z.string(), z.number()), year: z.record(z.string(), z.number()) }),
  processingTimeMs: z.number().optional(),
  /** 'database' while the index is rebuilt or away: PostgreSQL answered, and `note` says so */
  source: z.enum(['index', 'database']),
  note: z.string().optional(),
});
export type SearchResult = z.infer<typeof searchResultSchema>;
