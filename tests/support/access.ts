import { describe, expect, it, beforeAll, afterAll } from 'vitest';
import { ROLES, hasRole, type Role } from '../../shared/roles.js';
import { DEMO_ROLES } from '../../seeds/01_demo_people.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from './test-app.js';

/** Who may call a route: anyone (also signed out), any signed-in user, or holders of one of the roles. */
export type Audience = 'anyone' | 'signed-in' | Role[];

export interface RouteCase {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string | ((ids: SetupIds) => string);
  body?: unknown | ((ids: SetupIds) => unknown);
  who: Audience;
  /** A request that must be refused with 4xx as a permitted user (bad body, bad path or bad query). */
  bad?: { path?: string | ((ids: SetupIds) => string); body?: unknown };
}

export type SetupIds = Record<string, number | string>;

/** One demo login per role, for trying every role against a route. */
export const LOGIN_FOR_ROLE: Record<Role, string> = {
  reader: 'reader',
  contributor: 'coder1',
  curator: 'curator',
  reviewer: 'reviewer',
  admin: 'admin',
};

const permits = (who: Audience, login: string | null) => {
  if (who === 'anyone') return true;
  if (login === null) return false;
  if (who === 'signed-in') return true;
  return who.some((r) => hasRole(DEMO_ROLES[login] ?? [], r));
};

/**
 * Table-driven access checks: signed out → 401, each role that must be refused → 403, a permitted role →
 * neither; and bad input from a permitted user → 4xx with the error shape, never 5xx.
 * `setup` may create records the paths refer to; it runs once before the table.
 */
export function describeAccess(title: string, cases: RouteCase[], setup?: (t: TestApp, agents: Record<string, Agent>) => Promise<SetupIds>) {
  describe(`access: ${title}`, () => {
    let t: TestApp;
    const agents: Record<string, Agent> = {};
    let ids: SetupIds = {};
    beforeAll(async () => {
      t = await createTestApp();
      await resetDb(t.ctx.db);
      for (const login of Object.values(LOGIN_FOR_ROLE)) agents[login] = await signIn(t.app, login);
      ids = setup ? await setup(t, agents) : {};
    });
    afterAll(async () => {
      await t.close();
    });

    const resolveWith = <T>(v: T | ((ids: SetupIds) => T), with_: SetupIds) => (typeof v === 'function' ? (v as (ids: SetupIds) => T)(with_) : v);
    const resolve = <T>(v: T | ((ids: SetupIds) => T)) => resolveWith(v, ids);
    // every numeric id of the set-up swapped for one no record has
    const missingIds = () => Object.fromEntries(Object.entries(ids).map(([key, v], i) => [key, typeof v === 'number' ? 2_000_000_000 + i : v]));
    const send = (client: ReturnType<typeof anonymous> | Agent, c: RouteCase, path: string, body: unknown) => {
      const req = client[c.method](path);
      return body === undefined ? req : req.send(body as object);
    };

    for (const c of cases) {
      const label = `${c.method.toUpperCase()} ${typeof c.path === 'string' ? c.path : c.path.toString().replace(/^.*=>\s*/, '')}`;
      it(`${label}: signed out ${c.who === 'anyone' ? 'is let in' : 'gets 401'}`, async () => {
        const res = await send(anonymous(t.app), c, resolve(c.path), resolve(c.body));
        if (c.who === 'anyone') expect([401, 403]).not.toContain(res.status);
        else {
          expect(res.status).toBe(401);
          expect(res.body.error.code).toBe('unauthorized');
        }
      });
      for (const role of ROLES) {
        const login = LOGIN_FOR_ROLE[role];
        const allowed = permits(c.who, login);
        it(`${label}: ${role} ${allowed ? 'is let in' : 'gets 403'}`, async () => {
          const res = await send(agents[login], c, resolve(c.path), resolve(c.body));
          if (allowed) expect([401, 403]).not.toContain(res.status);
          else {
            expect(res.status).toBe(403);
            expect(res.body.error.code).toBe('forbidden');
          }
          expect(res.status).toBeLessThan(500);
        });
      }
      if (typeof c.path === 'function') {
        // Existence must not leak: a refused caller gets the very same answer for a record that does not exist.
        it(`${label}: refused callers get the same answer whether the record exists or not`, async () => {
          const missingPath = resolveWith(c.path, missingIds());
          if (missingPath === resolve(c.path)) return;
          const refused = [null, ...Object.values(LOGIN_FOR_ROLE)].filter((login) => !permits(c.who, login));
          for (const login of refused) {
            const client = login === null ? anonymous(t.app) : agents[login];
            const real = await send(client, c, resolve(c.path), resolve(c.body));
            const missing = await send(client, c, missingPath, resolveWith(c.body, missingIds()));
            expect({ who: login ?? 'signed out', status: missing.status, body: missing.body }).toEqual({ who: login ?? 'signed out', status: real.status, body: real.body });
          }
        });
      }
      if (c.bad) {
        it(`${label}: bad input gets 4xx with the error shape`, async () => {
          const login = Object.values(LOGIN_FOR_ROLE).find((l) => permits(c.who, l))!;
          const res = await send(agents[login], c, resolve(c.bad!.path ?? c.path), c.bad!.body);
          expect(res.status).toBeGreaterThanOrEqual(400);
          expect(res.status).toBeLessThan(500);
          expect(typeof res.body.error?.code).toBe('string');
          expect(typeof res.body.error?.message).toBe('string');
        });
      }
    }
  });
}
