import type { Knex } from 'knex';
import type { AppContext } from '../context.js';
import { MAIL_JOB, MAIL_RETRY_LIMIT } from '../mail/worker.js';

export type MailKind = 'assignment' | 'disputed' | 'settled';

export interface OutgoingMail {
  kind: MailKind;
  to: string;
  subject: string;
  body: string;
}

/**
 * Logs mails and hands each to the `mail.send` job, so a slow mail server never slows a request.
 * Call after the transaction that caused them has committed. When the queue is not running the mails
 * stay `queued` in the log (visible to admins).
 */
export async function queueMails(ctx: AppContext, mails: OutgoingMail[]): Promise<number[]> {
  const ids: number[] = [];
  for (const m of mails) {
    if (!m.to) continue;
    const [row] = await ctx.db('mail_log').insert({ kind: m.kind, to_address: m.to, subject: m.subject, body: m.body }).returning('id');
    ids.push(Number(row.id));
    if (ctx.env.JOBS_ENABLED !== 'true') continue;
    try {
      const jobId = await ctx.jobs.send(MAIL_JOB, { mailId: Number(row.id) }, { retryLimit: MAIL_RETRY_LIMIT, retryDelay: 1, retryBackoff: true });
      await ctx.db('mail_log').where({ id: row.id }).update({ job_id: jobId });
    } catch (err) {
      await ctx.db('mail_log').where({ id: row.id }).update({ last_error: `not queued: ${(err as Error).message}`.slice(0, 1000) });
    }
  }
  return ids;
}

export async function emailsOf(db: Knex | Knex.Transaction, userIds: number[]): Promise<Map<number, { email: string | null; login: string; name: string | null }>> {
  const rows = userIds.length ? await db('users').whereIn('id', userIds).select('id', 'email', 'login', 'name') : [];
  return new Map(rows.map((r: any) => [r.id, { email: r.email, login: r.login, name: r.name }]));
}

/** Curators' addresses (for "a pair became disputed"). */
export async function curatorEmails(db: Knex | Knex.Transaction): Promise<string[]> {
  const rows = await db('users as u').join('user_roles as r', 'r.user_id', 'u.id').where('r.role', 'curator').whereNotNull('u.email').distinct('u.email');
  return rows.map((r: any) => r.email);
}

export async function listMailLog(db: Knex, opts: { page: number; pageSize: number; status?: string; order: 'asc' | 'desc' }) {
  const base = db('mail_log').modify((q) => {
    if (opts.status) q.where('status', opts.status);
  });
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const rows = await base.clone().orderBy('id', opts.order).limit(opts.pageSize).offset((opts.page - 1) * opts.pageSize);
  return {
    total: Number(count),
    items: rows.map((r: any) => ({
      id: Number(r.id), kind: r.kind, to: r.to_address, subject: r.subject, status: r.status, attempts: r.attempts,
      lastError: r.last_error, createdAt: r.created_at, sentAt: r.sent_at,
    })),
  };
}
