import type { Request, RequestHandler } from 'express';
import rateLimit from 'express-rate-limit';
import type { ApiError } from '../../shared/schemas/common.js';

/** A per-client limit per minute that refuses with 429 in the API's error envelope. */
export function perMinuteLimit(limit: number, message: string, skip?: (req: Request) => boolean): RequestHandler {
  return rateLimit({
    windowMs: 60_000,
    limit,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    skip,
    handler: (_req, res) => {
      const body: ApiError = { error: { code: 'rate_limited', message } };
      res.status(429).json(body);
    },
  });
}
