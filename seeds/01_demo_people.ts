import type { Knex } from 'knex';
import { FAKE_IDENTITIES } from '../server/fakes/identities.js';
import type { Role } from '../shared/roles.js';

/** The demo consortium: each demo login holds the role it names (coder1 and coder2 are contributors). */
export const DEMO_ROLES: Record<string, Role[]> = {
  admin: ['admin', 'reader'],
  curator: ['curator', 'reader'],
  coder1: ['contributor', 'reader'],
  coder2: ['contributor', 'reader'],
  reviewer: ['reviewer', 'reader'],
  reader: ['reader'],
};

export async function ensureDemoPeople(knex: Knex): Promise<Map<string, number>> {
  const ids = new Map<string, number>();
  for (const who of FAKE_IDENTITIES) {
    const [row] = await knex('users')
      .insert({ github_id: String(who.id), login: who.login, name: who.name, email: who.email })
      .onConflict('github_id')
      .merge(['login', 'name', 'email'])
      .returning('id');
    ids.set(who.login, row.id);
    for (const role of DEMO_ROLES[who.login] ?? ['reader']) {
      await knex('user_roles').insert({ user_id: row.id, role }).onConflict(['user_id', 'role']).ignore();
    }
  }
  return ids;
}

export async function seed(knex: Knex): Promise<void> {
  await ensureDemoPeople(knex);
}
