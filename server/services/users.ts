import type { Knex } from 'knex';
import type { Role } from '../../shared/roles.js';
import { addRole, findUserWithRoles, listUsers, removeRole, upsertGithubUser, type UserSort } from '../db/users-repo.js';
import { ConflictError, NotFoundError } from '../lib/errors.js';
import { recordAudit } from './audit.js';

export { listUsers, type UserSort };

/** Signs a GitHub identity in: creates or updates the user, gives new users the reader role, admins by config. */
export async function signInGithubUser(
  db: Knex,
  profile: { githubId: string; login: string; name: string | null; email: string | null; avatarUrl: string | null },
  adminLogins: string[],
) {
  return db.transaction(async (trx) => {
    const existing = await trx('users').where({ github_id: profile.githubId }).first();
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

export async function grantRole(db: Knex, actorId: number, userId: number, role: Role) {
  return db.transaction(async (trx) => {
    const user = await findUserWithRoles(trx, userId);
    if (!user) throw new NotFoundError(`No user with id ${userId}.`);
    if (await addRole(trx, userId, role, actorId)) {
      await recordAudit(trx, { actorId, action: 'role.granted', entityType: 'user', entityId: userId, details: { role, login: user.login } });
    }
    return findUserWithRoles(trx, userId);
  });
}

export async function revokeRole(db: Knex, actorId: number, userId: number, role: Role) {
  return db.transaction(async (trx) => {
    const user = await findUserWithRoles(trx, userId);
    if (!user) throw new NotFoundError(`No user with id ${userId}.`);
    if (role === 'admin' && userId === actorId) {
      throw new ConflictError('You cannot remove your own admin role; ask another admin.');
    }
    if (await removeRole(trx, userId, role)) {
      await recordAudit(trx, { actorId, action: 'role.revoked', entityType: 'user', entityId: userId, details: { role, login: user.login } });
    }
    return findUserWithRoles(trx, userId);
  });
}
