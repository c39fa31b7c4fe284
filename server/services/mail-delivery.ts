import type { JobQueue } from '../adapters/jobs.js';
import { findMail, updateMail } from '../repositories/mail-log.js';
import type { Deps } from './deps.js';

export const MAIL_JOB = 'mail.send';

/**
 * pg-boss retries a failed send MAIL_RETRY_LIMIT times with exponential backoff: after the k-th failure it waits
 * between delay·2^(k-1) and delay·2^k seconds (pg-boss plans.js: delay·2^k/2·(1 + random)). With 11 retries from
 * 2 s the retries span at least 2·(2^11 − 1) s ≈ 68 min (at most about 2.3 h): a mail-server outage of
 * seconds is covered by the first retries, one of an hour by the last.
 */
export const MAIL_RETRY = { retryLimit: 11, retryDelay: 2, retryBackoff: true } as const;
export const MAIL_RETRY_LIMIT = MAIL_RETRY.retryLimit;
/** The shortest time from the first attempt to the last retry, in seconds. */
export const MAIL_RETRY_MIN_SPAN_S = MAIL_RETRY.retryDelay * (2 ** MAIL_RETRY.retryLimit - 1);

/** Delivers one queued mail; a throw lets pg-boss retry it, and the log row says how it went. */
export async function deliverMail(deps: Pick<Deps, 'db' | 'mailer'>, mailId: number, retryCount = 0): Promise<void> {
  const mail = await findMail(deps.db, mailId);
  if (!mail || mail.status === 'sent') return;
  const attempts = mail.attempts + 1;
  try {
    if (!deps.mailer) throw new Error('SMTP is not configured (set SMTP_HOST and SMTP_PORT).');
    const info = await deps.mailer.send({ to: mail.to_address, subject: mail.subject, text: mail.body });
    await updateMail(deps.db, mailId, { status: 'sent', attempts, sent: true, message_id: info.messageId, last_error: null });
  } catch (err) {
    const status = retryCount >= MAIL_RETRY_LIMIT ? 'failed' : 'retrying';
    await updateMail(deps.db, mailId, { status, attempts, last_error: String((err as Error)?.message ?? err).slice(0, 1000) });
    throw err;
  }
}

export async function registerMailWorkers(deps: Pick<Deps, 'db' | 'mailer'> & { jobs: JobQueue }): Promise<void> {
  await deps.jobs.work<{ mailId: number }>(MAIL_JOB, async (data, job) => deliverMail(deps, data.mailId, job.retryCount));
}
