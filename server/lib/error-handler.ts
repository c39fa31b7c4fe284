import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { ApiError } from '../../shared/schemas/common.js';
import { AppError } from './errors.js';
import { RateLimitedError } from './caller-budget.js';
import { isDatabaseUnavailable } from './db-unavailable.js';

const refusal = (code: string, message: string, details?: unknown): ApiError => ({ error: { code, message, ...(details !== undefined ? { details } : {}) } });

export const notFoundApi: RequestHandler = (req, res) => {
  res.status(404).json(refusal('not_found', `No API route ${req.method} ${req.path}.`));
};

/** SQLSTATEs of a value PostgreSQL cannot store (out of range, NUL or broken characters), as the caller reads them. */
const VALUE_REFUSALS: Record<string, string> = {
  '22003': 'A number in the request is out of range.',
  '22021': 'The request holds a character text cannot hold (a NUL or a broken character).',
  '22P05': 'The request holds a character text cannot hold (a NUL or a broken character).',
};

export function errorHandler(exposeInternals: boolean): ErrorRequestHandler {
  return (err, _req, res, _next) => {
    if (err instanceof AppError) {
      if (err instanceof RateLimitedError) res.set('Retry-After', String(err.retryAfterS));
      res.status(err.status).json(refusal(err.code, err.message, err.details));
      return;
    }
    // body-parser, multer and similar middleware set an HTTP status on their errors.
    const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
    if (status >= 400 && status < 500) {
      const message =
        err.type === 'entity.parse.failed'
          ? 'The request body is not valid JSON.'
          : err.type === 'entity.too.large'
            ? 'The request body is too large.'
            : String(err.message || 'Bad request.');
      res.status(status).json(refusal(err.code && typeof err.code === 'string' ? err.code.toLowerCase() : 'bad_request', message));
      return;
    }
    // A value the schemas let through but PostgreSQL cannot hold is still the caller's input (the transaction rolled back).
    const refusedValue = typeof err?.code === 'string' ? VALUE_REFUSALS[err.code] : undefined;
    if (refusedValue) {
      console.error('[value refused by PostgreSQL]', String(err?.message ?? err));
      res.status(400).json(refusal('invalid_input', refusedValue));
      return;
    }
    if (isDatabaseUnavailable(err)) {
      console.error('[db unavailable]', String(err?.message ?? err));
      res.status(503).set('Retry-After', '2').json(refusal('unavailable', 'The database cannot be reached just now. Try again in a few seconds.'));
      return;
    }
    console.error(err);
    res.status(500).json(refusal('internal', exposeInternals ? String(err?.stack ?? err) : 'Something went wrong on the server.'));
  };
}
