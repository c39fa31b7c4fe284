import type { Knex } from 'knex';
import type { MailLogEntry, MailLogPage } from '../../shared/schemas/admin.js';
import { pageOf } from '../../shared/schemas/common.js';
import type { Deps } from './deps.js';
import { MAIL_JOB, MAIL_RETRY } from './mail-delivery.js';
import { iso, isoOrNull, type PageRequest } from '../repositories/db.js';
import { findMail, insertMail, listMailLog as mailRows, lockMail, updateMail } from '../repositories/mail-log.js';
import { recordAudit } from '../repositories/audit.js';
import type { MailLogRow, MailStatus } from '../repositories/rows.js';
import { AppError, ConflictError, NotFoundError } from '../lib/errors.js';

export type MailKind = 'assignment' | 'disputed' | 'settled' | 'follow';

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
    if (deps.jobs) await enqueueMail({ db: deps.db, jobs: deps.jobs }, id);
  }
  return ids;
}

async function enqueueMail(deps: { db: Knex; jobs: NonNullable<Deps['jobs']> }, id: number): Promise<void> {
  try {
    const jobId = await deps.jobs.send(MAIL_JOB, { mailId: id }, { ...MAIL_RETRY });
    await updateMail(deps.db, id, { job_id: jobId });
  } catch (err) {
    await updateMail(deps.db, id, { last_error: `not queued: ${(err as Error).message}`.slice(0, 1000) });
  }
}

const toEntry = (r: MailLogRow): MailLogEntry => ({
  id: Number(r.id), kind: r.kind, to: r.to_address, subject: r.subject, status: r.status, attempts: r.attempts,
  lastError: r.last_error, createdAt: iso(r.created_at), sentAt: isoOrNull(r.sent_at), resendable: resendable(r),
});

const resendable = (r: MailLogRow) => r.status === 'failed' || (r.status === 'queued' && (r.job_id === null || r.last_error !== null));

/**
 * An admin sends a failed mail again (or one that never reached the queue): it goes back to `queued` with a fresh
 * job and the whole retry schedule. A sent mail, or one still being retried, is refused with 409.
 */
export async function resendMail(deps: Pick<Deps, 'db' | 'jobs'>, actorId: number, mailId: number): Promise<MailLogEntry> {
  if (!(await findMail(deps.db, mailId))) throw new NotFoundError(`There is no mail with id ${mailId}.`);
  const jobs = deps.jobs;
  if (!jobs) throw new AppError(503, 'jobs_unavailable', 'Mail cannot be resent: the background job queue is not running in this server.');
  await deps.db.transaction(async (trx) => {
    const mail = await lockMail(trx, mailId);
    if (!mail) throw new NotFoundError(`There is no mail with id ${mailId}.`);
    if (mail.status === 'sent') throw new ConflictError('This mail was already sent; it is not sent twice.');
    if (!resendable(mail)) throw new ConflictError('This mail is already waiting to be sent; reload the log to see its state.');
    await updateMail(trx, mailId, { status: 'queued', last_error: null, job_id: null });
    await recordAudit(trx, { actorId, action: 'mail.resent', entityType: 'mail', entityId: mailId, details: { to: mail.to_address, previousStatus: mail.status } });
  });
  await enqueueMail({ db: deps.db, jobs }, mailId);
  return toEntry((await findMail(deps.db, mailId))!);
}

export async function listMailLog(db: Knex, opts: PageRequest & { status?: MailStatus; order: 'asc' | 'desc' }): Promise<MailLogPage> {
  const { total, rows } = await mailRows(db, opts);
  return pageOf(rows.map(toEntry), total, opts);
}
