import { z } from 'zod';

export const idParam = z.coerce.number().int().positive();
/** `:id` in a path. */
export const idParamsSchema = z.object({ id: idParam });

/** `page` and `pageSize` of a paged list's query (pages of at most 200). */
export function pageRequestSchema(defaultPageSize = 25) {
  return z.object({
    page: z.coerce.number().int().min(1).default(1),
    pageSize: z.coerce.number().int().min(1).max(200).default(defaultPageSize),
  });
}

/** A paged list's query sorted on the server: page, pageSize, sort (one of the fields) and order. */
export function pagingSchema<const S extends readonly [string, ...string[]]>(
  sortFields: S,
  defaultSort: S[number],
  defaults: { order?: 'asc' | 'desc'; pageSize?: number } = {},
) {
  return pageRequestSchema(defaults.pageSize).extend({
    sort: z.enum(sortFields).default(defaultSort as never),
    order: z.enum(['asc', 'desc']).default(defaults.order ?? 'asc'),
  });
}

/** An instant as the API writes it: ISO 8601 in UTC ("2026-12-01T09:30:00.000Z"). */
export const timestamp = z.string();

/** The one shape of every paged list the API answers. */
export function pageSchema<T extends z.ZodType>(item: T) {
  return z.object({ items: z.array(item), total: z.number().int().min(0), page: z.number().int().min(1), pageSize: z.number().int().min(1) });
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

/** Builds a page from the rows of one page, the total and the request's paging. */
export function pageOf<T>(items: T[], total: number, q: { page: number; pageSize: number }): Page<T> {
  return { items, total, page: q.page, pageSize: q.pageSize };
}

/** The one envelope of every refusal: a code, a message and, for bad input, the fields at fault. */
export const apiErrorSchema = z.object({
  error: z.object({ code: z.string(), message: z.string(), details: z.unknown().optional() }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;

/** A field problem in `error.details` of a 400. */
export const fieldErrorSchema = z.object({ path: z.string(), message: z.string() });
export type FieldError = z.infer<typeof fieldErrorSchema>;

/** Someone named in an answer (who made a decision, uploaded a file, started an import). */
export const actorSchema = z.object({ id: z.number().int(), login: z.string() });
