import type { Knex } from 'knex';
import type { Role } from '../../shared/roles.js';

export interface UserRow {
  id: number;
  github_id: string;
  login: string;
  name: string | null;
  email: string | null;
  avatar_url: string | null;
  created_at: Date;
  last_seen_at: Date | null;
}

export async function findUserWithRoles(db: Knex, id: number) {
  const user = await db<UserRow>('users').where({ id }).first();
  if (!user) return undefined;
  const roles = await db('user_roles').where({ user_id: id }).orderBy('role').pluck('role');
  return { ...user, roles: roles as Role[] };
}

export async function upsertGithubUser(
  db: Knex,
  profile: { githubId: string; login: string; name: string | null; email: string | null; avatarUrl: string | null },
): Promise<UserRow> {
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
  return row;
}

export async function userRoles(db: Knex, userId: number): Promise<Role[]> {
  return (await db('user_roles').where({ user_id: userId }).orderBy('role').pluck('role')) as Role[];
}

export async function addRole(db: Knex, userId: number, role: Role, grantedBy: number | null): Promise<boolean> {
  const inserted = await db('user_roles')
    .insert({ user_id: userId, role, granted_by: grantedBy })
    .onConflict(['user_id', 'role'])
    .ignore()
    .returning('role');
  return inserted.length > 0;
}

export async function removeRole(db: Knex, userId: number, role: Role): Promise<boolean> {
  return (await db('user_roles').where({ user_id: userId, role }).delete()) > 0;
}

export type UserSort = 'login' | 'name' | 'created_at' | 'last_seen_at';

export async function listUsers(
  db: Knex,
  opts: { page: number; pageSize: number; sort: UserSort; order: 'asc' | 'desc'; q?: string },
) {
  const base = db<UserRow>('users').modify((qb) => {
    if (opts.q) qb.whereILike('login', `%${opts.q}%`).orWhereILike('name', `%${opts.q}%`);
  });
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const rows = await base
    .clone()
    .select('users.*')
    .orderBy(opts.sort, opts.order, 'last')
    .orderBy('id')
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize);
  const ids = rows.map((r: UserRow) => r.id);
  const roleRows: Array<{ user_id: number; role: Role }> = ids.length ? await db('user_roles').whereIn('user_id', ids).select('user_id', 'role') : [];
  const rolesById = new Map<number, Role[]>();
  for (const r of roleRows) rolesById.set(r.user_id, [...(rolesById.get(r.user_id) ?? []), r.role]);
  return {
    total: Number(count),
    items: rows.map((r: UserRow) => ({
      id: r.id,
      login: r.login,
      name: r.name,
      email: r.email,
      createdAt: r.created_at,
      lastSeenAt: r.last_seen_at,
      roles: (rolesById.get(r.id) ?? []).sort(),
    })),
  };
}
