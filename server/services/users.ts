import type { Knex } from 'knex';
import type { Role } from '../../shared/roles.js';
import { pageOf } from '../../shared/schemas/common.js';
import type { AdminUserPage, RoleChangeResult } from '../../shared/schemas/users.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, isoOrNull, type PageRequest } from '../repositories/db.js';
import { addRole, findUserByGithubId, findUserWithRoles, listUsers as userRows, removeRole, upsertGithubUser, type GithubProfile, type UserSort } from '../repositories/users.js';
import { ConflictError, NotFoundError } from '../lib/errors.js';

export type { UserSort };

export async function listUsers(db: Knex, opts: PageRequest & { sort: UserSort; order: 'asc' | 'desc'; q?: string }): Promise<AdminUserPage> {
  const { total, rows } = await userRows(db, opts);
  const items = rows.map((r) => ({ id: r.id, login: r.login, name: r.name, email: r.email, createdAt: iso(r.created_at), lastSeenAt: isoOrNull(r.last_seen_at), roles: r.roles }));
  return pageOf(items, total, opts);
}

/** The user behind a session, with roles; undefined when the account is gone. */
export async function sessionUser(db: Knex, id: number) {
  return findUserWithRoles(db, id);
}

/** Signs a GitHub identity in: creates or updates the user, gives new users the reader role, admins by config. */
export async function signInGithubUser(db: Knex, profile: GithubProfile, adminLogins: string[]) {
  return db.transaction(async (trx) => {
    const existing = await findUserByGithubId(trx, profile.githubId);
    const user = await upsertGithubUser(trx, profile);
    if (!existing) {
      await addRole(trx, user.id, 'reader', null);
      await recordAudit(trx, { actorId: user.id, action: 'user.created', entityType: 'user', entityId: user.id, details: { login: user.login } });
    }
    if (adminLogins.includes(user.login.toLowerCase()) && (await addRole(trx, user.id, 'admin', null))) {
      await recordAudit(trx, { actorId: null, action: 'role.granted', entityType: 'user', entityId: user.id, details: { role: 'admin', reason: 'named in ADMIN_LOGINS' } });
    }
    return user;
  });
}

async function changeRole(db: Knex, actorId: number, userId: number, role: Role, grant: boolean): Promise<RoleChangeResult> {
  return db.transaction(async (trx) => {
    const user = await findUserWithRoles(trx, userId);
    if (!user) throw new NotFoundError(`No user with id ${userId}.`);
    if (!grant && role === 'admin' && userId === actorId) throw new ConflictError('You cannot remove your own admin role; ask another admin.');
    const changed = grant ? await addRole(trx, userId, role, actorId) : await removeRole(trx, userId, role);
    if (changed) await recordAudit(trx, { actorId, action: grant ? 'role.granted' : 'role.revoked', entityType: 'user', entityId: userId, details: { role, login: user.login } });
    const after = (await findUserWithRoles(trx, userId))!;
    return { user: { id: after.id, login: after.login, roles: after.roles } };
  });
}

export const grantRole = (db: Knex, actorId: number, userId: number, role: Role) => changeRole(db, actorId, userId, role, true);
export const revokeRole = (db: Knex, actorId: number, userId: number, role: Role) => changeRole(db, actorId, userId, role, false);
