import type { Knex } from 'knex';
import type { RequestHandler } from 'express';
import { UnauthorizedError } from '../lib/errors.js';
import { userForToken } from '../services/api-tokens.js';

export function bearerToken(header: string | undefined): string | undefined {
  const m = /^Bearer\s+(\S+)$/i.exec(header ?? '');
  return m?.[1];
}

/** Authenticates `Authorization: Bearer <token>`; a wrong or revoked token is refused at once. */
export function bearerAuth(db: Knex): RequestHandler {
  return async (req, _res, next) => {
    const token = bearerToken(req.headers.authorization);
    if (!token) return next();
    const user = await userForToken(db, token);
    if (!user) throw new UnauthorizedError('The API token is not valid or has been revoked.');
    req.user = user;
    next();
  };
}
