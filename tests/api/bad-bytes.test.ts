import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Knex } from 'knex';
import { ROLES } from '../../shared/roles.js';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { createReference } from '../../server/services/references.js';

// Every route, fed NUL bytes and lone surrogates in its path, its query and its body: always 4xx with the error
// shape, and no table changes.
const BAD = { nul: 'a\u0000b', surrogate: 'a\ud800b' } as const;

interface RouteInfo {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
}

/** Every route the app serves under /api and /auth, read from Express's own router stack. */
function routesOf(app: TestApp['app']): RouteInfo[] {
  const out: RouteInfo[] = [];
  type Layer = { rawPath?: string; handle?: { stack?: Layer[] }; route?: { path: string; methods: Record<string, boolean> } };
  for (const layer of (app as unknown as { router: { stack: Layer[] } }).router.stack) {
    const mount = layer.rawPath;
    if (mount !== '/api' && mount !== '/auth') continue;
    for (const inner of layer.handle?.stack ?? []) {
      if (!inner.route) continue;
      for (const m of Object.keys(inner.route.methods)) {
        if (m === '_all') continue;
        out.push({ method: m as RouteInfo['method'], path: `${mount}${inner.route.path}` });
      }
    }
  }
  return out.filter((r, i) => out.findIndex((o) => o.method === r.method && o.path === r.path) === i);
}

/** Every field name of every request schema would be long to keep by hand: these cover the API's bodies and queries. */
const FIELDS = [
  'q', 'text', 'title', 'name', 'label', 'note', 'reason', 'rationale', 'format', 'status', 'source', 'sort', 'order', 'doi',
  'abstract', 'container', 'term', 'description', 'slug', 'metric', 'outcome', 'manipulation', 'population', 'modality',
  'task', 'estimator', 'ids', 'decision', 'value', 'role', 'login', 'search', 'filter', 'kind', 'comment', 'quote', 'page',
];

/** Routes that read nothing from a body (the path says it all): a body is ignored and the write is the route's own. */
const TAKES_NO_BODY = new Set(['put /api/admin/users/:id/roles/:role', 'delete /api/admin/users/:id/roles/:role', 'delete /api/follows/:id']);

function badObject(bad: string) {
  const body: Record<string, unknown> = Object.fromEntries(FIELDS.map((f) => [f, bad]));
  body.version = 1;
  body.authors = [{ family: bad, given: bad }];
  body.filters = { manipulation: [bad], q: bad };
  body[`key${bad}`] = 'x';
  return body;
}

/** A fingerprint of every application table (sessions excepted), so a half-written request shows. */
async function fingerprint(db: Knex): Promise<string> {
  const tables: string[] = (
    await db.raw(`SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename NOT LIKE 'knex_migrations%' AND tablename <> 'session'`)
  ).rows.map((r: { tablename: string }) => r.tablename);
  const parts = await Promise.all(
    tables.sort().map(async (t) => {
      const { rows } = await db.raw(`SELECT count(*)::int AS n, md5(coalesce(string_agg(x::text, '|' ORDER BY x::text), '')) AS h FROM "${t}" x`);
      return `${t}:${rows[0].n}:${rows[0].h}`;
    }),
  );
  return parts.join('\n');
}

describe('NUL bytes and lone surrogates on every route', () => {
  let t: TestApp;
  let agent: Agent;
  let refId = 0;
  beforeAll(async () => {
    t = await createTestApp();
    const ids = await resetDb(t.ctx.db);
    // one user with every role, so no route stops at its role check before it reads the input
    const admin = ids.get('admin')!;
    for (const role of ROLES) await t.ctx.db('user_roles').insert({ user_id: admin, role }).onConflict(['user_id', 'role']).ignore();
    agent = await signIn(t.app, 'admin');
    const ref = await t.ctx.db.transaction((trx) => createReference(trx, { title: 'Bad bytes fixture', author: [{ family: 'Fixture' }], issued: { 'date-parts': [[2021]] } }, { source: 'seed' }));
    refId = ref.id;
  });
  afterAll(() => t.close());

  type Answer = { status: number; body: { error?: { code?: unknown; message?: unknown } } };
  const failures: string[] = [];
  const refused = (res: Answer) => res.status >= 400 && res.status < 500 && typeof res.body.error?.code === 'string' && typeof res.body.error?.message === 'string';
  const expectRefusal = (res: Answer, what: string) => {
    if (!refused(res)) failures.push(`${what}: ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`);
  };

  it('finds the routes to sweep', () => {
    expect(routesOf(t.app).length).toBeGreaterThan(80);
  });

  it('refuses them in every path, query and body with 4xx and writes nothing', async () => {
    const routes = routesOf(t.app).filter((r) => r.path !== '/auth/github' && r.path !== '/auth/github/callback' && r.path !== '/auth/logout');
    for (const r of routes) {
      const before = await fingerprint(t.ctx.db);
      for (const [kind, bad] of Object.entries(BAD)) {
        const standIn = (p: string) => (/slug|term/i.test(p) ? 'time-dilation' : /role/.test(p) ? 'reader' : String(refId));
        const withIds = r.path.replace(/:[A-Za-z]+/g, standIn);
        if (kind === 'nul') {
          const badQuery = `?${FIELDS.map((f) => `${f}=${encodeURIComponent(bad)}`).join('&')}`;
          // a path parameter with a NUL (lone surrogates cannot be written in a URL)
          for (const p of r.path.match(/:[A-Za-z]+/g) ?? []) {
            const path = r.path.replace(/:[A-Za-z]+/g, (q) => `${standIn(q)}${q === p ? '%00' : ''}`);
            const res = await agent[r.method](path).send(r.method === 'get' ? undefined : {});
            expectRefusal(res, `${r.method.toUpperCase()} ${path} (${kind} in ${p})`);
          }
          const res = await agent[r.method](`${withIds}${badQuery}`).send(r.method === 'get' ? undefined : {});
          // a route that reads no query answers as usual
          if (res.status >= 400) expectRefusal(res, `${r.method.toUpperCase()} ${r.path} (${kind} in the query)`);
        }
        if (r.method !== 'get' && !TAKES_NO_BODY.has(`${r.method} ${r.path}`)) {
          const res = await agent[r.method](withIds).send(badObject(bad));
          expectRefusal(res, `${r.method.toUpperCase()} ${r.path} (${kind} in the body)`);
        }
      }
      if (!TAKES_NO_BODY.has(`${r.method} ${r.path}`) && (await fingerprint(t.ctx.db)) !== before) failures.push(`${r.method.toUpperCase()} ${r.path} wrote something`);
    }
    expect(failures).toEqual([]);
  }, 240_000);

  // Valid requests but for one field: the refusal names that field and says what is wrong with it.
  const BIB = (title: string) => `@article{ok1, title={Fine}, author={Ok, An}, year={2020}}\n@article{bad2, title={${title}}, author={Bad, A}, year={2021}}\n`;
  const RIS = (title: string) => `TY  - JOUR\nTI  - ${title}\nAU  - Ris, A\nPY  - 2020\nER  - \n`;
  const cases: Array<{ what: string; method: 'get' | 'post' | 'patch'; path: () => string; body?: (bad: string) => unknown; query?: (bad: string) => string; field: string }> = [
    { what: 'a BibTeX import', method: 'post', path: () => '/api/imports', body: (b) => ({ format: 'bibtex', text: BIB(b) }), field: 'body.text' },
    { what: 'a RIS import', method: 'post', path: () => '/api/imports', body: (b) => ({ format: 'ris', text: RIS(b) }), field: 'body.text' },
    { what: 'a DOI list', method: 'post', path: () => '/api/imports', body: (b) => ({ format: 'doi', text: `10.5555/ok1\n10.5555/${b}` }), field: 'body.text' },
    { what: "an import's label", method: 'post', path: () => '/api/imports', body: (b) => ({ format: 'bibtex', text: BIB('Fine too'), label: b }), field: 'body.label' },
    { what: "a reference's title", method: 'patch', path: () => `/api/references/${refId}`, body: (b) => ({ version: 1, title: b }), field: 'body.title' },
    { what: "an author's name", method: 'patch', path: () => `/api/references/${refId}`, body: (b) => ({ version: 1, authors: [{ family: b }] }), field: 'body.authors.0.family' },
    { what: 'a screening note', method: 'post', path: () => `/api/references/${refId}/screening`, body: (b) => ({ decision: 'excluded', reason: 'other', note: b }), field: 'body.note' },
    { what: "a token's name", method: 'post', path: () => '/api/tokens', body: (b) => ({ name: b }), field: 'body.name' },
    { what: 'a vocabulary label', method: 'post', path: () => '/api/manipulations', body: (b) => ({ term: 'bad_bytes', label: b }), field: 'body.label' },
    { what: 'a synthesis filter', method: 'post', path: () => '/api/syntheses', body: (b) => ({ filters: { population: b } }), field: 'body.filters.population' },
    { what: 'a search query', method: 'get', path: () => '/api/search', query: (b) => `q=${encodeURIComponent(b)}`, field: 'query.q' },
    { what: 'a reference list filter', method: 'get', path: () => '/api/references', query: (b) => `q=${encodeURIComponent(b)}`, field: 'query.q' },
  ];
  for (const c of cases) {
    for (const [kind, bad] of Object.entries(BAD)) {
      if (c.query && kind === 'surrogate') continue; // a URL cannot carry a lone surrogate
      it(`refuses ${kind === 'nul' ? 'a NUL' : 'a lone surrogate'} in ${c.what}, naming ${c.field}`, async () => {
        const before = await fingerprint(t.ctx.db);
        const req = agent[c.method](c.query ? `${c.path()}?${c.query(bad)}` : c.path());
        const res = c.body ? await req.send(c.body(bad) as object) : await req;
        expect(res.status).toBe(400);
        expect(res.body.error.code).toBe('invalid_input');
        expect(res.body.error.message).toMatch(kind === 'nul' ? /NUL character/ : /broken character/);
        expect(res.body.error.details).toContainEqual({ path: c.field, message: expect.stringMatching(kind === 'nul' ? /NUL/ : /UTF-16/) });
        expect(await fingerprint(t.ctx.db)).toBe(before);
      });
    }
  }

  it('refuses a NUL in an uploaded file and in a multipart field', async () => {
    const file = await agent.post('/api/imports').attach('file', Buffer.from(BIB('Nul\u0000here')), 'x.bib');
    expect(file.status).toBe(400);
    expect(file.body.error.details[0].path).toBe('body.file');
    const label = await agent.post('/api/imports').field('label', 'a\u0000b').attach('file', Buffer.from(BIB('Fine')), 'x.bib');
    expect(label.status).toBe(400);
    expect(label.body.error.details[0].path).toBe('body.label');
    expect(Number((await t.ctx.db('import_batches').count({ n: '*' }).first())?.n)).toBe(0);
  });
});
