import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { deliverMail } from '../../server/services/mail-delivery.js';
import { queueMails } from '../../server/services/mail.js';
import { createTestApp, resetDb, signIn, type TestApp } from '../support/test-app.js';

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
    const until = Date.now() + 15_000;
    let row;
    while (Date.now() < until) {
      row = await t.ctx.db('mail_log').where({ id }).first();
      if (row.status === 'sent') break;
      await new Promise((r) => setTimeout(r, 150));
    }
    expect(row.status).toBe('sent');
    expect(row.job_id).toBeTruthy();
    const box = (await (await fetch(`${process.env.MAILBOX_URL}/messages?to=someone@lab.example`)).json()) as any;
    expect(box.messages[0]).toMatchObject({ subject: 'Chronometa: test – ü', text: 'Line one\nLíne two' });
  });

  it('a refused send is retried and ends as failed with its error, shown to admins only', async () => {
    // No job here: drive the worker's delivery directly, as pg-boss would on each retry.
    const [row] = await t.ctx.db('mail_log').insert({ kind: 'settled', to_address: 'refuse-me@lab.example', subject: 's', body: 'b' }).returning('id');
    for (let attempt = 1; attempt <= 4; attempt++) {
      await expect(deliverMail(t.ctx, Number(row.id))).rejects.toThrow();
      const now = await t.ctx.db('mail_log').where({ id: row.id }).first();
      expect(now.attempts).toBe(attempt);
      expect(now.status).toBe(attempt <= 3 ? 'retrying' : 'failed');
    }
    const admin = await signIn(t.app, 'admin');
    const log = await admin.get('/api/mail/log?status=failed');
    expect(log.body.items).toEqual([expect.objectContaining({ to: 'refuse-me@lab.example', status: 'failed', attempts: 4 })]);
    expect(log.body.items[0].lastError).toMatch(/451/);
    const reader = await signIn(t.app, 'reader');
    expect((await reader.get('/api/mail/log')).status).toBe(403);
  });
});
