import { createTestApp, resetDb, signIn, type Agent, type TestApp } from './test-app.js';

export interface CodingTeam {
  t: TestApp;
  /** seeded user ids by login */
  ids: Map<string, number>;
  curator: Agent;
  coder1: Agent;
  coder2: Agent;
}

/** A fresh app on the seeded users, with a curator and two contributors signed in. */
export async function codingTeam(opts: Parameters<typeof createTestApp>[0] = {}): Promise<CodingTeam> {
  const t = await createTestApp(opts);
  const ids = await resetDb(t.ctx.db);
  return { t, ids, curator: await signIn(t.app, 'curator'), coder1: await signIn(t.app, 'coder1'), coder2: await signIn(t.app, 'coder2') };
}
