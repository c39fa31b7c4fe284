import type { z } from 'zod';
import { keepable } from '../../shared/schemas/common.js';
import { ValidationError } from './errors.js';

/**
 * Parses input with a zod schema; on failure throws a 400 naming each offending field. Every input first passes
 * the shared `keepableInput` refinement (no NUL bytes or lone surrogates in any string or key).
 */
export function parseInput<S extends z.ZodType>(schema: S, data: unknown, where = 'body'): z.infer<S> {
  const result = keepable(schema).safeParse(data);
  if (result.success) return result.data;
  const details = result.error.issues.map((i) => ({
    path: [where, ...i.path.map(String)].join('.'),
    message: i.message,
  }));
  const first = details[0];
  const message = first ? `${first.path}: ${first.message}` : `Invalid ${where}.`;
  throw new ValidationError(details.length > 1 ? `${message} (and ${details.length - 1} more)` : message, details);
}
