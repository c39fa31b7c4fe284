import type { JobQueue } from '../adapters/jobs.js';
import { findMail, updateMail } from '../repositories/mail-log.js';
import type { Deps } from './deps.js';

export const MAIL_JOB = 'mail.send';
/** pg-boss retries a failed send this many times (with backoff) before the mail is marked failed. */
export const MAIL_RETRY_LIMIT = 3;

/** Delivers one queued mail; a throw lets pg-boss retry it, and the log row says how it went. */
export async function deliverMail(deps: Pick<Deps, 'db' | 'mailer'>, mailId: number): Promise<void> {
  const mail = await findMail(deps.db, mailId);
  if (!mail || mail.status === 'sent') return;
  const attempts = mail.attempts + 1;
  try {
    if (!deps.mailer) throw new Error('SMTP is not configured (set SMTP_HOST and SMTP_PORT).');
    const info = await deps.mailer.send({ to: mail.to_address, subject: mail.subject, text: mail.body });
    await updateMail(deps.db, mailId, { status: 'sent', attempts, sent: true, message_id: info.messageId, last_error: null });
  } catch (err) {
    const status = attempts > MAIL_RETRY_LIMIT ? 'failed' : 'retrying';
    await updateMail(deps.db, mailId, { status, attempts, last_error: String((err as Error)?.message ?? err).slice(0, 1000) });
    throw err;
  }
}

export async function registerMailWorkers(deps: Pick<Deps, 'db' | 'mailer'> & { jobs: JobQueue }): Promise<void> {
  await deps.jobs.work<{ mailId: number }>(MAIL_JOB, async (data) => deliverMail(deps, data.mailId));
}
