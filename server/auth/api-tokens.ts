import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import type { RequestHandler } from 'express';
import { userRoles } from '../db/users-repo.js';
import { NotFoundError, UnauthorizedError } from '../lib/errors.js';
import { recordAudit } from '../services/audit.js';

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

export function bearerToken(header: string | undefined): string | undefined {
  const m = /^Bearer\s+(\S+)$/i.exec(header ?? '');
  return m?.[1];
}

/** Authenticates `Authorization: Bearer <token>`; a wrong or revoked token is refused at once. */
export function bearerAuth(db: Knex): RequestHandler {
  return async (req, _res, next) => {
    const token = bearerToken(req.headers.authorization);
    if (!token) return next();
    const row = await db('api_tokens')
      .join('users', 'users.id', 'api_tokens.user_id')
      .where('api_tokens.token_hash', hashToken(token))
      .whereNull('api_tokens.revoked_at')
      .first('api_tokens.id as token_id', 'users.id', 'users.login', 'users.name', 'users.email');
    if (!row) throw new UnauthorizedError('The API token is not valid or has been revoked.');
    req.user = { id: row.id, login: row.login, name: row.name, email: row.email, roles: await userRoles(db, row.id), via: 'token' };
    void db('api_tokens').where({ id: row.token_id }).update({ last_used_at: new Date() }).catch(() => undefined);
    next();
  };
}

export async function createApiToken(db: Knex, userId: number, name: string) {
  const token = `cmt_${randomBytes(24).toString('base64url')}`;
  return db.transaction(async (trx) => {
    const [row] = await trx('api_tokens')
      .insert({ user_id: userId, name, token_hash: hashToken(token), prefix: token.slice(0, 10) })
      .returning(['id', 'name', 'prefix', 'created_at']);
    await recordAudit(trx, { actorId: userId, action: 'token.created', entityType: 'api_token', entityId: row.id, details: { name } });
    return { id: row.id, name: row.name, prefix: row.prefix, createdAt: row.created_at, token };
  });
}

export async function listApiTokens(db: Knex, userId: number) {
  const rows = await db('api_tokens').where({ user_id: userId }).orderBy('id', 'desc');
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    prefix: r.prefix,
    createdAt: r.created_at,
    lastUsedAt: r.last_used_at,
    revokedAt: r.revoked_at,
  }));
}

export async function revokeApiToken(db: Knex, userId: number, tokenId: number) {
  return db.transaction(async (trx) => {
    const updated = await trx('api_tokens')
      .where({ id: tokenId, user_id: userId })
      .whereNull('revoked_at')
      .update({ revoked_at: new Date() })
      .returning('id');
    if (!updated.length) throw new NotFoundError(`You have no active token with id ${tokenId}.`);
    await recordAudit(trx, { actorId: userId, action: 'token.revoked', entityType: 'api_token', entityId: tokenId });
  });
}
