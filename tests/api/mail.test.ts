import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { deliverMail, MAIL_RETRY_LIMIT, MAIL_RETRY_MIN_SPAN_S } from '../../server/services/mail-delivery.js';
import { queueMails } from '../../server/services/mail.js';
import { startFakeSmtp } from '../../server/fakes/smtp.js';
import { freePorts } from '../support/ports.js';
import { createTestApp, resetDb, signIn, type TestApp } from '../support/test-app.js';

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function waitForStatus(t: TestApp, id: number, status: string, ms = 20_000) {
  const until = Date.now() + ms;
  let row;
  while (Date.now() < until) {
    row = await t.ctx.db('mail_log').where({ id }).first();
    if (row.status === status) return row;
    await sleep(150);
  }
  return row;
}

describe('mail: pg-boss job, delivery to the fake SMTP, failures visible to admins', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp({ jobs: true });
    await resetDb(t.ctx.db);
    await fetch(`${process.env.MAILBOX_URL}/messages`, { method: 'DELETE' });
  });
  afterAll(() => t.close());

  it('queues a mail as a job, delivers it and logs it as sent', async () => {
    const [id] = await queueMails(t.ctx, [{ kind: 'assignment', to: 'someone@lab.example', subject: 'Chronometa: test – ü', body: 'Line one\nLíne two' }]);
    const row = await waitForStatus(t, id, 'sent', 15_000);
    expect(row.status).toBe('sent');
    expect(row.job_id).toBeTruthy();
    const box = (await (await fetch(`${process.env.MAILBOX_URL}/messages?to=someone@lab.example`)).json()) as any;
    expect(box.messages[0]).toMatchObject({ subject: 'Chronometa: test – ü', text: 'Line one\nLíne two' });
  });

  it('queues each mail with retries and backoff spanning at least an hour', async () => {
    const [id] = await queueMails(t.ctx, [{ kind: 'assignment', to: 'span@lab.example', subject: 's', body: 'b' }]);
    const { job_id } = await t.ctx.db('mail_log').where({ id }).first();
    const job = await t.ctx.db('pgboss.job').where({ id: job_id }).first();
    expect(job).toMatchObject({ retry_limit: MAIL_RETRY_LIMIT, retry_backoff: true });
    // pg-boss (plans.js) waits delay·2^k/2·(1 + random) after failure k (k = 1, 2, …): at least delay·2^(k-1).
    let shortest = 0;
    for (let k = 1; k <= job.retry_limit; k++) shortest += (job.retry_delay * 2 ** k) / 2;
    expect(shortest).toBe(MAIL_RETRY_MIN_SPAN_S);
    expect(shortest).toBeGreaterThanOrEqual(3600);
  });

  it('a refused send is retried and ends as failed with its error, shown to admins only', async () => {
    // No job here: drive the worker's delivery directly, as pg-boss would on each retry.
    const [row] = await t.ctx.db('mail_log').insert({ kind: 'settled', to_address: 'refuse-me@lab.example', subject: 's', body: 'b' }).returning('id');
    for (let retry = 0; retry <= MAIL_RETRY_LIMIT; retry++) {
      await expect(deliverMail(t.ctx, Number(row.id), retry)).rejects.toThrow();
      const now = await t.ctx.db('mail_log').where({ id: row.id }).first();
      expect(now.attempts).toBe(retry + 1);
      expect(now.status).toBe(retry < MAIL_RETRY_LIMIT ? 'retrying' : 'failed');
    }
    const admin = await signIn(t.app, 'admin');
    const log = await admin.get('/api/mail/log?status=failed');
    expect(log.body.items).toEqual([expect.objectContaining({ to: 'refuse-me@lab.example', status: 'failed', attempts: MAIL_RETRY_LIMIT + 1 })]);
    expect(log.body.items[0].lastError).toMatch(/451/);
    const reader = await signIn(t.app, 'reader');
    expect((await reader.get('/api/mail/log')).status).toBe(403);
  });

  it('an admin resends a failed mail: queued again, delivered, audited; a sent or waiting mail is refused', async () => {
    const [failed] = await t.ctx
      .db('mail_log')
      .insert({ kind: 'settled', to_address: 'resend-me@lab.example', subject: 'Chronometa: resent', body: 'b', status: 'failed', attempts: 12, last_error: 'connect ECONNREFUSED' })
      .returning('id');
    const id = Number(failed.id);
    const admin = await signIn(t.app, 'admin');
    const res = await admin.post(`/api/mail/${id}/resend`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id, status: 'queued', lastError: null });
    expect((await waitForStatus(t, id, 'sent')).status).toBe('sent');
    const box = (await (await fetch(`${process.env.MAILBOX_URL}/messages?to=resend-me@lab.example`)).json()) as any;
    expect(box.total).toBe(1);

    const again = await admin.post(`/api/mail/${id}/resend`);
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already sent/);
    const [retrying] = await t.ctx.db('mail_log').insert({ kind: 'settled', to_address: 'x@lab.example', subject: 's', body: 'b', status: 'retrying', attempts: 2 }).returning('id');
    expect((await admin.post(`/api/mail/${retrying.id}/resend`)).status).toBe(409);
    const missing = await admin.post('/api/mail/999999/resend');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('not_found');
    const audit = await t.ctx.db('audit_log').where({ action: 'mail.resent', entity_id: String(id) });
    expect(audit).toHaveLength(1);
  });
});

describe('mail: an SMTP outage', () => {
  let t: TestApp;
  let smtpPort: number;
  let mailboxPort: number;
  beforeAll(async () => {
    [smtpPort, mailboxPort] = await freePorts(2);
    // Nothing listens on the mail port yet: the relay is down.
    t = await createTestApp({ jobs: true, env: { SMTP_PORT: String(smtpPort) } });
  });
  afterAll(() => t.close());

  it('is retried with backoff and the mail goes out once the relay is back', async () => {
    const [id] = await queueMails(t.ctx, [{ kind: 'assignment', to: 'outage@lab.example', subject: 'after the outage', body: 'b' }]);
    const first = await waitForStatus(t, id, 'retrying', 10_000);
    expect(first.status).toBe('retrying');
    expect(first.last_error).toMatch(/ECONNREFUSED|connect/i);
    const relay = await startFakeSmtp(smtpPort, mailboxPort);
    try {
      const row = await waitForStatus(t, id, 'sent', 25_000);
      expect(row.status).toBe('sent');
      expect(row.attempts).toBeGreaterThanOrEqual(2);
      expect(relay.messages.map((m) => m.subject)).toEqual(['after the outage']);
    } finally {
      relay.smtp.close();
      relay.mailbox.close();
    }
  }, 40_000);
});
