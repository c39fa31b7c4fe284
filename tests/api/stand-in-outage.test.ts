import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FakeName } from '../../server/fakes/run.js';
import { freePorts } from '../support/ports.js';
import { bib, eventually } from '../support/references.js';
import { startStandIns, type StandIns } from '../support/stand-ins.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference } from './extraction-fixtures.js';

// Private stand-ins, each its own OS process as under npm start, and an app configured to them. Each is killed
// in turn (SIGKILL): that feature answers in words that it is away, the others go on, and it recovers once the
// stand-in is started again.
describe('one stand-in killed: the product keeps working and recovers when it is back', () => {
  let fakes: StandIns;
  let env: NodeJS.ProcessEnv;
  let t: TestApp;
  let coder: Agent;
  let curator: Agent;
  let ids: Map<string, number>;
  let mailbox: string;
  let doiCount = 0;

  const health = async () => (await anonymous(t.app).get('/api/health')).body;
  const search = async (q: string) => (await anonymous(t.app).get(`/api/search?q=${encodeURIComponent(q)}`)).body;
  const kill = async (name: FakeName) => {
    const p = fakes.processes[name];
    const gone = new Promise((r) => p.once('exit', r));
    p.kill('SIGKILL');
    await gone;
  };
  const restart = async (name: FakeName) => {
    const again = await startStandIns(env, [name]);
    fakes.processes[name] = again.processes[name];
  };

  /** Imports a fresh DOI (the stand-in generates a record for any 10.5555/gen.*) and returns the batch id. */
  async function importDoi() {
    doiCount += 1;
    const res = await coder.post('/api/imports').send({ format: 'doi', text: `10.5555/gen.${process.pid}${doiCount}` });
    expect(res.status).toBe(202);
    return res.body.batch.id as number;
  }
  const batchDone = (id: number, timeoutMs = 20_000) =>
    eventually(async () => {
      const r = await coder.get(`/api/imports/${id}`);
      return r.body.batch.state === 'done' ? r.body : undefined;
    }, timeoutMs);

  /** Assigns a new reference to both coders: each is mailed. Returns the subject to look for. */
  async function mailCoders() {
    const ref = await insertReference(t.ctx.db, { firstAuthor: `Outage${Date.now()}`, year: 2021 });
    const res = await curator.post('/api/assignments').send({ referenceId: ref, coder1Id: ids.get('coder1'), coder2Id: ids.get('coder2') });
    expect(res.status).toBe(201);
    return (await t.ctx.db('refs').where({ id: ref }).first('first_author')).first_author as string;
  }
  const mailArrived = (author: string, timeoutMs = 20_000) =>
    eventually(async () => {
      const r = await fetch(`${mailbox}/messages?to=${encodeURIComponent('meilin.hartwell@tempora-lab.example')}`);
      const body = (await r.json()) as { messages: { subject: string }[] };
      return body.messages.find((m) => m.subject.includes(author));
    }, timeoutMs);

  /** Every part but `away` is up, and each of their features works. */
  async function othersWork(away: FakeName) {
    const h = await health();
    const part = { oauth: 'oauth', search: 'search', doi: 'doi', mail: 'mail' } as const;
    for (const name of ['oauth', 'search', 'doi', 'mail'] as const) {
      if (name !== away) expect(h.parts[part[name]].state, name).toBe('up');
    }
    expect(h.parts.database.state).toBe('up');
    if (away !== 'oauth') expect((await (await signIn(t.app, 'reviewer')).get('/api/me')).status).toBe(200);
    if (away !== 'search') expect((await eventually(async () => ((await search('chronostasis')).source === 'index' ? search('chronostasis') : undefined))).total).toBe(1);
    if (away !== 'doi') expect((await batchDone(await importDoi())).batch.counts.imported).toBe(1);
    if (away !== 'mail') await mailArrived(await mailCoders());
  }

  beforeAll(async () => {
    const [oauth, meili, doi, smtp, mbox] = await freePorts(5);
    mailbox = `http://127.0.0.1:${mbox}`;
    env = { ...process.env, FAKE_OAUTH_PORT: String(oauth), FAKE_MEILI_PORT: String(meili), FAKE_DOI_PORT: String(doi), FAKE_SMTP_PORT: String(smtp), FAKE_MAILBOX_PORT: String(mbox) };
    fakes = await startStandIns(env);
    const o = `http://127.0.0.1:${oauth}`;
    t = await createTestApp({
      jobs: true,
      env: {
        GITHUB_AUTHORIZATION_URL: `${o}/login/oauth/authorize`, GITHUB_TOKEN_URL: `${o}/login/oauth/access_token`,
        GITHUB_USER_PROFILE_URL: `${o}/api/user`, GITHUB_USER_EMAIL_URL: `${o}/api/user/emails`,
        MEILI_HOST: `http://127.0.0.1:${meili}`, DOI_RESOLVER_URL: `http://127.0.0.1:${doi}`, DOI_TIMEOUT_MS: '2000',
        SMTP_PORT: String(smtp), MAILBOX_URL: mailbox,
      },
    });
    ids = await resetDb(t.ctx.db);
    coder = await signIn(t.app, 'coder1');
    curator = await signIn(t.app, 'curator');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text: bib('o1', { title: 'Chronostasis after saccades', author: 'Varga, Ilse', year: '2018', doi: '10.5555/outage.1' }) });
    expect(res.status).toBe(201);
    expect((await health()).status).toBe('ok');
  });
  afterAll(async () => {
    await t?.close();
    await fakes?.stop();
  });

  it('search away: answers from the database and says so; the rest works; the index comes back', async () => {
    await kill('search');
    const away = await search('chronostasis');
    expect(away).toMatchObject({ source: 'database', total: 1 });
    expect(away.note).toMatch(/search index cannot be reached/);
    const h = await health();
    expect(h.status).toBe('degraded');
    expect(h.parts.search).toMatchObject({ state: 'down', message: expect.stringMatching(/cannot be reached/) });
    await othersWork('search');
    await restart('search');
    // it came back empty: rebuilt in the background, answered from the database meanwhile
    const back = await eventually(async () => {
      const r = await search('chronostasis');
      return r.source === 'index' ? r : undefined;
    });
    expect(back.total).toBe(1);
    expect((await health()).status).toBe('ok');
  }, 90_000);

  it('DOI resolver away: look-ups wait with "resolver unreachable, will retry"; the rest works; they import when it is back', async () => {
    await kill('doi');
    const batch = await importDoi();
    const waiting = await eventually(async () => {
      const r = await coder.get(`/api/imports/${batch}`);
      return r.body.entries[0]?.message ? r.body : undefined;
    });
    expect(waiting.batch).toMatchObject({ state: 'running', counts: { pending: 1 } });
    expect(waiting.entries[0].message).toMatch(/resolver unreachable, will retry \(the DOI resolver could not be reached/);
    expect((await health()).parts.doi).toMatchObject({ state: 'down', message: expect.stringMatching(/cannot be reached/) });
    await othersWork('doi');
    await restart('doi');
    expect((await batchDone(batch, 70_000)).batch.counts).toMatchObject({ imported: 1, pending: 0 });
    expect((await health()).parts.doi.state).toBe('up');
  }, 120_000);

  it('mail away: the action still succeeds, the mail waits to be retried; the rest works; it is delivered when SMTP is back', async () => {
    await kill('mail');
    const author = await mailCoders();
    const logged = await eventually(async () => {
      const row = await t.ctx.db('mail_log').where('subject', 'like', `%${author}%`).where({ status: 'retrying' }).first();
      return row ?? undefined;
    });
    expect(logged.last_error).toBeTruthy();
    expect((await health()).parts.mail.state).toBe('down');
    await othersWork('mail');
    await restart('mail');
    await mailArrived(author, 70_000);
  }, 120_000);

  it('sign-in provider away: health says so, signed-in people keep working; sign-in works again when it is back', async () => {
    await kill('oauth');
    const h = await health();
    expect(h.status).toBe('degraded');
    expect(h.parts.oauth).toMatchObject({ state: 'down', message: expect.stringMatching(/cannot be reached/) });
    expect((await coder.get('/api/me')).status).toBe(200);
    await expect(signIn(t.app, 'reader')).rejects.toThrow();
    await othersWork('oauth');
    await restart('oauth');
    expect((await (await signIn(t.app, 'reader')).get('/api/me')).status).toBe(200);
    expect((await health()).status).toBe('ok');
  }, 90_000);
});
