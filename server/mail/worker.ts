import type { AppContext } from '../context.js';
import { findMail, updateMail } from '../repositories/mail-log.js';
import { createMailTransport } from './transport.js';

export const MAIL_JOB = 'mail.send';
/** pg-boss retries a failed send this many times (with backoff) before the mail is marked failed. */
export const MAIL_RETRY_LIMIT = 3;

/** Delivers one queued mail; a throw lets pg-boss retry it, and the log row says how it went. */
export async function deliverMail(ctx: AppContext, mailId: number): Promise<void> {
  const mail = await findMail(ctx.db, mailId);
  if (!mail || mail.status === 'sent') return;
  const attempts = mail.attempts + 1;
  try {
    const transport = createMailTransport(ctx.env);
    if (!transport) throw new Error('SMTP is not configured (set SMTP_HOST and SMTP_PORT).');
    const info = await transport.sendMail({ from: ctx.env.MAIL_FROM, to: mail.to_address, subject: mail.subject, text: mail.body });
    await updateMail(ctx.db, mailId, { status: 'sent', attempts, sent: true, message_id: info.messageId ?? null, last_error: null });
  } catch (err) {
    const status = attempts > MAIL_RETRY_LIMIT ? 'failed' : 'retrying';
    await updateMail(ctx.db, mailId, { status, attempts, last_error: String((err as Error)?.message ?? err).slice(0, 1000) });
    throw err;
  }
}

export async function registerMailWorkers(ctx: AppContext): Promise<void> {
  await ctx.jobs.work<{ mailId: number }>(MAIL_JOB, async (data) => deliverMail(ctx, data.mailId));
}
