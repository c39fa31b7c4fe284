import { rolesImplying, type Role } from '../../shared/roles.js';
import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import type { UserRoleRow, UserRow } from './rows.js';

export interface GithubProfile {
  githubId: string;
  login: string;
  name: string | null;
  email: string | null;
  avatarUrl: string | null;
}

export type UserWithRoles = UserRow & { roles: Role[] };

export async function findUserByGithubId(db: Db, githubId: string): Promise<UserRow | undefined> {
  return db<UserRow>('users').where({ github_id: githubId }).first();
}

export async function findUserWithRoles(db: Db, id: number): Promise<UserWithRoles | undefined> {
  const user = await db<UserRow>('users').where({ id }).first();
  if (!user) return undefined;
  return { ...user, roles: await userRoles(db, id) };
}

export async function upsertGithubUser(db: Db, profile: GithubProfile): Promise<UserRow> {
  const [row] = await db<UserRow>('users')
    .insert({
      github_id: profile.githubId,
      login: profile.login,
      name: profile.name,
      email: profile.email,
      avatar_url: profile.avatarUrl,
      last_seen_at: new Date(),
    })
    .onConflict('github_id')
    .merge(['login', 'name', 'email', 'avatar_url', 'last_seen_at'])
    .returning('*');
  return row as UserRow;
}

export async function userRoles(db: Db, userId: number): Promise<Role[]> {
  return db<UserRoleRow>('user_roles').where({ user_id: userId }).orderBy('role').pluck('role');
}

export async function addRole(db: Db, userId: number, role: Role, grantedBy: number | null): Promise<boolean> {
  const inserted = await db<UserRoleRow>('user_roles')
    .insert({ user_id: userId, role, granted_by: grantedBy })
    .onConflict(['user_id', 'role'])
    .ignore()
    .returning('role');
  return inserted.length > 0;
}

export async function removeRole(db: Db, userId: number, role: Role): Promise<boolean> {
  return (await db<UserRoleRow>('user_roles').where({ user_id: userId, role }).delete()) > 0;
}

export type UserSort = 'login' | 'name' | 'created_at' | 'last_seen_at';

export async function listUsers(db: Db, opts: PageRequest & { sort: UserSort; order: 'asc' | 'desc'; q?: string }) {
  const base = db<UserRow>('users').modify((qb) => {
    if (opts.q) qb.whereILike('login', `%${opts.q}%`).orWhereILike('name', `%${opts.q}%`);
  });
  const total = await countRows(base);
  const rows: UserRow[] = await pageOf(base.clone().select('users.*').orderBy(opts.sort, opts.order, 'last').orderBy('id'), opts);
  const ids = rows.map((r) => r.id);
  const roleRows: Pick<UserRoleRow, 'user_id' | 'role'>[] = ids.length ? await db<UserRoleRow>('user_roles').whereIn('user_id', ids).select('user_id', 'role') : [];
  const rolesById = new Map<number, Role[]>();
  for (const r of roleRows) rolesById.set(r.user_id, [...(rolesById.get(r.user_id) ?? []), r.role]);
  return { total, rows: rows.map((r) => ({ ...r, roles: (rolesById.get(r.id) ?? []).sort() })) };
}

export interface Contact {
  email: string | null;
  login: string;
  name: string | null;
}

/** Name and address of each user, by id. */
export async function contactsOf(db: Db, userIds: number[]): Promise<Map<number, Contact>> {
  const rows: Pick<UserRow, 'id' | 'email' | 'login' | 'name'>[] = userIds.length ? await db<UserRow>('users').whereIn('id', userIds).select('id', 'email', 'login', 'name') : [];
  return new Map(rows.map((r) => [r.id, { email: r.email, login: r.login, name: r.name }]));
}

/** Addresses of everyone holding a role (for "a pair became disputed"). */
export async function emailsWithRole(db: Db, role: Role): Promise<string[]> {
  const rows: { email: string }[] = await db('users as u').join('user_roles as r', 'r.user_id', 'u.id').whereIn('r.role', rolesImplying(role)).whereNotNull('u.email').distinct('u.email');
  return rows.map((r) => r.email);
}

export async function loginOf(db: Db, id: number | null | undefined): Promise<string | null> {
  if (!id) return null;
  const row = await db<UserRow>('users').where({ id }).first('login');
  return row?.login ?? null;
}

export interface UserWithRoleList {
  id: number;
  login: string;
  email: string | null;
  roles: Role[];
}

/** Users by id with their roles (one query). */
export async function usersWithRoles(db: Db, ids: number[]): Promise<UserWithRoleList[]> {
  return db('users as u')
    .leftJoin('user_roles as r', 'r.user_id', 'u.id')
    .whereIn('u.id', ids)
    .select('u.id', 'u.login', 'u.email', db.raw(`coalesce(array_agg(r.role) filter (where r.role is not null), '{}') as roles`))
    .groupBy('u.id');
}

/** Who holds the curator role (and so may reconcile). */
export async function curatorIds(db: Db): Promise<number[]> {
  const rows: { user_id: number }[] = await db('user_roles').whereIn('role', rolesImplying('curator')).distinct('user_id');
  return rows.map((r) => r.user_id);
}

/** Everyone who may code: whoever holds a role that implies contributor. */
export async function listCoders(db: Db): Promise<Array<Pick<UserRow, 'id' | 'login' | 'name'> & { curator: boolean }>> {
  return db('users as u')
    .join('user_roles as r', 'r.user_id', 'u.id')
    .whereIn('r.role', rolesImplying('contributor'))
    .groupBy('u.id')
    .select('u.id', 'u.login', 'u.name', db.raw(`bool_or(r.role = any(?)) as curator`, [rolesImplying('curator')]))
    .orderBy('u.login');
}
