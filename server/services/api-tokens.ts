import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import { insertToken, ownerOfTokenHash, revokeTokenChain, tokensOf, touchToken } from '../repositories/api-tokens.js';
import { recordAudit } from '../repositories/audit.js';
import { userRoles } from '../repositories/users.js';
import type { ApiTokenList, CreatedToken } from '../../shared/schemas/users.js';
import { NotFoundError } from '../lib/errors.js';
import { iso, isoOrNull } from '../repositories/db.js';

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** The user a token acts for, or null for a wrong or revoked token. */
export async function userForToken(db: Knex, token: string): Promise<Express.User | null> {
  const row = await ownerOfTokenHash(db, hashToken(token));
  if (!row) return null;
  void touchToken(db, row.token_id).catch(() => undefined);
  return { id: row.id, login: row.login, name: row.name, email: row.email, roles: await userRoles(db, row.id), via: 'token', tokenId: row.token_id };
}

/** `mintedByTokenId`: the Bearer token the caller was authenticated with, if any (revoking it revokes this one). */
export async function createApiToken(db: Knex, userId: number, name: string, mintedByTokenId: number | null = null): Promise<CreatedToken> {
  const token = `cmt_${randomBytes(24).toString('base64url')}`;
  return db.transaction(async (trx) => {
    const row = await insertToken(trx, { user_id: userId, name, token_hash: hashToken(token), prefix: token.slice(0, 10), minted_by_token_id: mintedByTokenId });
    await recordAudit(trx, { actorId: userId, action: 'token.created', entityType: 'api_token', entityId: row.id, details: mintedByTokenId === null ? { name } : { name, mintedByTokenId } });
    return { id: row.id, name: row.name, prefix: row.prefix, createdAt: iso(row.created_at), token };
  });
}

export async function listApiTokens(db: Knex, userId: number): Promise<ApiTokenList> {
  const rows = await tokensOf(db, userId);
  return { items: rows.map((r) => ({ id: r.id, name: r.name, prefix: r.prefix, createdAt: iso(r.created_at), lastUsedAt: isoOrNull(r.last_used_at), revokedAt: isoOrNull(r.revoked_at) })) };
}

export async function revokeApiToken(db: Knex, userId: number, tokenId: number): Promise<void> {
  await db.transaction(async (trx) => {
    const revoked = await revokeTokenChain(trx, userId, tokenId);
    if (!revoked.length) throw new NotFoundError(`You have no active token with id ${tokenId}.`);
    await recordAudit(trx, { actorId: userId, action: 'token.revoked', entityType: 'api_token', entityId: tokenId, details: revoked.length > 1 ? { alsoRevoked: revoked.slice(1) } : undefined });
  });
}
