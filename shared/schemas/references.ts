import { z } from 'zod';
import { EXCLUSION_REASONS, SCREENING_DECISIONS, SCREENING_STATUSES } from '../vocabulary/screening.js';
import { pagingSchema } from './common.js';

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

export const ENTRY_STATUSES = ['pending', 'imported', 'duplicate', 'rejected'] as const;
export type EntryStatus = (typeof ENTRY_STATUSES)[number];

export interface ImportEntryView {
  index: number;
  status: EntryStatus;
  message?: string;
  referenceId?: number;
  key?: string;
  likelyDuplicateOf?: number;
}
export interface ImportBatchView {
  id: number;
  format: ImportFormat;
  label: string | null;
  state: 'running' | 'done';
  total: number;
  processed: number;
  counts: { imported: number; duplicate: number; rejected: number; pending: number };
  createdAt: string;
  finishedAt: string | null;
  createdBy: { id: number; login: string } | null;
}
export interface ImportResult {
  batch: ImportBatchView;
  entries: ImportEntryView[];
  /** How many entries match (all of them, or those of the requested status). */
  entriesTotal?: number;
}

export const importListQuerySchema = pagingSchema(['created_at', 'format', 'total'] as const, 'created_at').extend({
  order: z.enum(['asc', 'desc']).default('desc'),
});

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
  batch: z.coerce.number().int().positive().optional(),
});
export type ReferenceListQuery = z.infer<typeof referenceListQuerySchema>;

const personSchema = z.object({
  family: z.string().trim().min(1, 'family name is required').max(200),
  given: z.string().trim().max(200).optional(),
});

/** The fields a contributor may edit on a reference; the rest of the CSL-JSON is kept as imported. */
export const referenceEditSchema = z.object({
  version: z.number().int().positive({ message: 'send the version you edited' }),
  title: z.string().trim().min(1, 'a reference needs a title').max(1000).optional(),
  year: z.number().int().min(1000, 'year must be four digits').max(3000, 'year must be four digits').nullable().optional(),
  authors: z.array(personSchema).max(500).optional(),
  container: z.string().trim().max(500).nullable().optional(),
  doi: z
    .string()
    .trim()
    .transform((s) => normaliseDoi(s) ?? s)
    .refine((s) => s === '' || DOI_PATTERN.test(s), 'a DOI looks like 10.5555/abc')
    .nullable()
    .optional(),
  abstract: z.string().max(20_000).nullable().optional(),
});
export type ReferenceEdit = z.infer<typeof referenceEditSchema>;

export const screeningDecisionSchema = z
  .object({
    decision: z.enum(SCREENING_DECISIONS, { message: 'decision must be included or excluded' }),
    reason: z.enum(EXCLUSION_REASONS, { message: 'pick a reason from the list' }).optional(),
    note: z.string().trim().max(2000).optional(),
  })
  .superRefine((v, ctx) => {
    if (v.decision === 'excluded' && !v.reason) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'an exclusion needs a reason' });
    if (v.decision === 'included' && v.reason) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'an inclusion takes no exclusion reason' });
    if (v.reason === 'other' && !v.note) ctx.addIssue({ code: 'custom', path: ['note'], message: 'say why, when the reason is "other"' });
  });
export type ScreeningDecisionInput = z.infer<typeof screeningDecisionSchema>;

export const screeningQueueQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(100).default(20),
  batch: z.coerce.number().int().positive().optional(),
});

export const duplicateListQuerySchema = pagingSchema(['created_at', 'year'] as const, 'created_at').extend({
  status: z.enum(['open', 'merged', 'dismissed']).default('open'),
});
export const mergeSchema = z.object({ keep: z.number().int().positive().optional() });

export const searchQuerySchema = z.object({
  q: z.string().trim().max(200).default(''),
  yearFrom: z.coerce.number().int().min(1000).max(3000).optional(),
  yearTo: z.coerce.number().int().min(1000).max(3000).optional(),
  status: z.enum(SCREENING_STATUSES).optional(),
  limit: z.coerce.number().int().min(1).max(100).default(20),
  offset: z.coerce.number().int().min(0).max(10_000).default(0),
});
export type SearchQuery = z.infer<typeof searchQuerySchema>;

export interface SearchHit {
  id: number;
  title: string;
  year: number | null;
  authors: string[];
  doi: string | null;
  container: string | null;
  screeningStatus: string;
}
export interface SearchResult {
  hits: SearchHit[];
  total: number;
  facets: { screening_status: Record<string, number>; year: Record<string, number> };
  processingTimeMs?: number;
}

export const exportQuerySchema = z.object({
  format: z.enum(['bibtex', 'csl-json']),
  ids: z
    .string()
    .regex(/^\d+(,\d+)*$/, 'ids is a comma-separated list of reference ids')
    .transform((s) => s.split(',').map(Number))
    .refine((a) => a.length <= 5000, 'export at most 5,000 references at a time'),
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
