import type { Db } from './db.js';
import type { ApiTokenRow, UserRow } from './rows.js';

export async function insertToken(db: Db, row: Pick<ApiTokenRow, 'user_id' | 'name' | 'token_hash' | 'prefix' | 'minted_by_token_id'>): Promise<Pick<ApiTokenRow, 'id' | 'name' | 'prefix' | 'created_at'>> {
  const [created] = await db<ApiTokenRow>('api_tokens').insert(row).returning(['id', 'name', 'prefix', 'created_at']);
  return created;
}

export async function tokensOf(db: Db, userId: number): Promise<ApiTokenRow[]> {
  return db<ApiTokenRow>('api_tokens').where({ user_id: userId }).orderBy('id', 'desc');
}

/**
 * Marks the user's live token revoked and, with it, every live token minted from it down the chain (children of
 * children too); answers the ids revoked, the named token first, or [] when the user has no live token with that id.
 */
export async function revokeTokenChain(db: Db, userId: number, tokenId: number): Promise<number[]> {
  const root = await db<ApiTokenRow>('api_tokens').where({ id: tokenId, user_id: userId }).whereNull('revoked_at').forUpdate().first('id');
  if (!root) return [];
  const chain = await db.raw<{ rows: { id: number }[] }>(
    `with recursive chain(id) as (
       select id from api_tokens where id = ?
       union
       select t.id from api_tokens t join chain c on t.minted_by_token_id = c.id
     )
     update api_tokens set revoked_at = now()
      where id in (select id from chain) and revoked_at is null
      returning id`,
    [tokenId],
  );
  const ids = chain.rows.map((r) => r.id);
  return [tokenId, ...ids.filter((id) => id !== tokenId).sort((a, b) => a - b)];
}

/** The owner of a live (not revoked) token, by the token's hash. */
export async function ownerOfTokenHash(db: Db, tokenHash: string): Promise<(Pick<UserRow, 'id' | 'login' | 'name' | 'email'> & { token_id: number }) | undefined> {
  return db('api_tokens')
    .join('users', 'users.id', 'api_tokens.user_id')
    .where('api_tokens.token_hash', tokenHash)
    .whereNull('api_tokens.revoked_at')
    .first('api_tokens.id as token_id', 'users.id', 'users.login', 'users.name', 'users.email');
}

export async function touchToken(db: Db, tokenId: number): Promise<void> {
  await db<ApiTokenRow>('api_tokens').where({ id: tokenId }).update({ last_used_at: new Date() });
}
