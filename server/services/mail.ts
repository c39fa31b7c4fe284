import type { Knex } from 'knex';
import type { MailLogPage } from '../../shared/schemas/admin.js';
import { pageOf } from '../../shared/schemas/common.js';
import type { Deps } from './deps.js';
import { MAIL_JOB, MAIL_RETRY_LIMIT } from './mail-delivery.js';
import { iso, isoOrNull, type PageRequest } from '../repositories/db.js';
import { insertMail, listMailLog as mailRows, updateMail } from '../repositories/mail-log.js';
import type { MailStatus } from '../repositories/rows.js';

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
export async function queueMails(deps: Pick<Deps, 'db' | 'jobs'>, mails: OutgoingMail[]): Promise<number[]> {
  const ids: number[] = [];
  for (const m of mails) {
    if (!m.to) continue;
    const id = await insertMail(deps.db, m);
    ids.push(id);
    if (!deps.jobs) continue;
    try {
      const jobId = await deps.jobs.send(MAIL_JOB, { mailId: id }, { retryLimit: MAIL_RETRY_LIMIT, retryDelay: 1, retryBackoff: true });
      await updateMail(deps.db, id, { job_id: jobId });
    } catch (err) {
      await updateMail(deps.db, id, { last_error: `not queued: ${(err as Error).message}`.slice(0, 1000) });
    }
  }
  return ids;
}

export async function listMailLog(db: Knex, opts: PageRequest & { status?: MailStatus; order: 'asc' | 'desc' }): Promise<MailLogPage> {
  const { total, rows } = await mailRows(db, opts);
  const items = rows.map((r) => ({
    id: Number(r.id), kind: r.kind, to: r.to_address, subject: r.subject, status: r.status, attempts: r.attempts,
    lastError: r.last_error, createdAt: iso(r.created_at), sentAt: isoOrNull(r.sent_at),
  }));
  return pageOf(items, total, opts);
}
