import type { RequestHandler } from 'express';
import { ForbiddenError } from '../lib/errors.js';
import { bearerToken } from './api-tokens.js';

const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

function originOf(value: string | undefined): string | undefined {
  if (!value) return undefined;
  try {
    return new URL(value).origin;
  } catch {
    return 'invalid';
  }
}

/**
 * Cross-site request forgery check for cookie-authenticated requests (OWASP CSRF cheat sheet: verify the
 * Origin header, falling back to Referer, on top of SameSite cookies). Bearer-token requests are exempt.
 */
export function originCheck(allowedOrigins: string[]): RequestHandler {
  const allowed = new Set(allowedOrigins);
  return (req, _res, next) => {
    if (!UNSAFE.has(req.method) || bearerToken(req.headers.authorization)) return next();
    const origin = originOf(req.headers.origin as string | undefined) ?? originOf(req.headers.referer);
    if (origin === undefined) {
      if (req.headers.cookie) throw new ForbiddenError('Cross-site check failed: the request carries no Origin or Referer header.');
      return next();
    }
    if (!allowed.has(origin)) throw new ForbiddenError(`Cross-site check failed: requests from ${origin} are not accepted.`);
    next();
  };
}
