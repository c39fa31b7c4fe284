import type { z } from 'zod';
import { keepable } from '../../shared/schemas/common.js';
import { fieldProblemInWords, plainWords } from '../../shared/schemas/plain-words.js';
import { ValidationError } from './errors.js';

/**
 * Parses input with a zod schema; on failure throws a 400 naming each offending field. Every input first passes
 * the shared `keepableInput` refinement (no NUL bytes or lone surrogates in any string or key). The message is in
 * words ("Confidence level: must be below 1."); `details` keep each field's path for forms to place it.
 */
export function parseInput<S extends z.ZodType>(schema: S, data: unknown, where = 'body'): z.infer<S> {
  const result = keepable(schema).safeParse(data, { error: plainWords });
  if (result.success) return result.data;
  const details = result.error.issues.map((i) => ({
    path: [where, ...i.path.map(String)].join('.'),
    message: i.message,
  }));
  const first = result.error.issues[0];
  const message = first ? fieldProblemInWords(first.path, first.message) : 'The request is not in the expected form.';
  throw new ValidationError(details.length > 1 ? `${message.replace(/\.$/, '')} (and ${details.length - 1} more).` : message, details);
}
