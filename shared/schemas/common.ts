import { z } from 'zod';

export const idParam = z.coerce.number().int().positive();

export function pagingSchema<const S extends readonly [string, ...string[]]>(sortFields: S, defaultSort: S[number]) {
  return z.object({
    page: z.coerce.number().int().min(1).default(1),
    pageSize: z.coerce.number().int().min(1).max(200).default(25),
    sort: z.enum(sortFields).default(defaultSort as never),
    order: z.enum(['asc', 'desc']).default('asc'),
  });
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

export const apiErrorSchema = z.object({
  error: z.object({ code: z.string(), message: z.string(), details: z.unknown().optional() }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;
