import { z } from 'zod';
// zod's fallback messages in words for people (installs z.config once, for both ends)
import './plain-words.js';

/** An id in a path or query: a positive integer PostgreSQL's `integer` holds (so `99999999999999999999` is refused). */
export const MAX_ID = 2_147_483_647;
export const idParam = z.coerce.number().refine((n) => Number.isInteger(n) && n >= 1 && n <= MAX_ID, 'not an id (ids are whole numbers from 1 to 2147483647)');
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

// ---- text PostgreSQL cannot keep

const NUL = '\u0000';
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** Why a string cannot be kept as text (a NUL byte or half of a UTF-16 surrogate pair), or null. */
export function unkeepableText(s: string): string | null {
  if (s.includes(NUL)) return 'contains a NUL character (U+0000), which text cannot hold; remove it';
  const m = LONE_SURROGATE.exec(s);
  if (m) return `contains a broken character (half of a UTF-16 pair, U+${m[0].charCodeAt(0).toString(16).toUpperCase()}) at position ${m.index + 1}; remove or re-type it`;
  return null;
}

/** Every string and key in a value that cannot be kept as text, with its path (at most `limit`). */
export function findUnkeepableText(value: unknown, limit = 20): Array<{ path: Array<string | number>; message: string }> {
  const out: Array<{ path: Array<string | number>; message: string }> = [];
  const walk = (v: unknown, path: Array<string | number>) => {
    if (out.length >= limit) return;
    if (typeof v === 'string') {
      const problem = unkeepableText(v);
      if (problem) out.push({ path, message: problem });
    } else if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...path, i]));
    else if (v && typeof v === 'object') {
      for (const [k, x] of Object.entries(v)) {
        const problem = unkeepableText(k);
        if (problem) out.push({ path: [...path, k], message: `the field name ${problem}` });
        walk(x, [...path, k]);
      }
    }
  };
  walk(value, []);
  return out;
}

/**
 * The refinement in front of every request schema (the server's parseInput pipes through it): no string or key
 * anywhere in the input may hold a NUL or a lone surrogate. `keepable(schema)` is the same for one schema.
 */
export const keepableInput = z.unknown().superRefine((v, ctx) => {
  for (const p of findUnkeepableText(v)) ctx.addIssue({ code: 'custom', path: p.path, message: p.message });
});
export const keepable = <S extends z.ZodType>(schema: S) => keepableInput.pipe(schema);
