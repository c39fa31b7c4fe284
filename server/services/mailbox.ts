import { pageOf } from '../../shared/schemas/common.js';
import type { MailboxMessage, MailboxPage } from '../../shared/schemas/admin.js';
import { AppError } from '../lib/errors.js';

/** One page of the configured mail catcher's messages (MAILBOX_URL), optionally to one address. */
export async function readMailbox(mailboxUrl: string | undefined, q: { to?: string; page: number; pageSize: number }): Promise<MailboxPage> {
  if (!mailboxUrl) throw new AppError(503, 'mailbox_unconfigured', 'No mailbox is configured (set MAILBOX_URL to the mail catcher).');
  const url = new URL('/messages', mailboxUrl);
  if (q.to) url.searchParams.set('to', q.to);
  let body: { messages: MailboxMessage[]; total: number };
  try {
    const r = await fetch(url, { signal: AbortSignal.timeout(5000) });
    if (!r.ok) throw new Error(`answered ${r.status}`);
    body = (await r.json()) as typeof body;
  } catch (err) {
    throw new AppError(502, 'mailbox_unreachable', `The mailbox at ${mailboxUrl} could not be read: ${(err as Error).message}`);
  }
  const start = (q.page - 1) * q.pageSize;
  return pageOf(body.messages.slice(start, start + q.pageSize), body.messages.length, q);
}
