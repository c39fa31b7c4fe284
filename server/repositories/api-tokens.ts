import type { Db } from './db.js';
import type { ApiTokenRow, UserRow } from './rows.js';

export async function insertToken(db: Db, row: Pick<ApiTokenRow, 'user_id' | 'name' | 'token_hash' | 'prefix'>): Promise<Pick<ApiTokenRow, 'id' | 'name' | 'prefix' | 'created_at'>> {
  const [created] = await db<ApiTokenRow>('api_tokens').insert(row).returning(['id', 'name', 'prefix', 'created_at']);
  return created;
}

export async function tokensOf(db: Db, userId: number): Promise<ApiTokenRow[]> {
  return db<ApiTokenRow>('api_tokens').where({ user_id: userId }).orderBy('id', 'desc');
}

/** Marks the user's live token revoked; false when there is none with that id. */
export async function revokeToken(db: Db, userId: number, tokenId: number): Promise<boolean> {
  const updated = await db<ApiTokenRow>('api_tokens').where({ id: tokenId, user_id: userId }).whereNull('revoked_at').update({ revoked_at: new Date() }).returning('id');
  return updated.length > 0;
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
