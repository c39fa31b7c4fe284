import { Router } from 'express';
import { z } from 'zod';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { AppError } from '../lib/errors.js';
import { parseInput } from '../lib/validate.js';
import { listMailLog } from '../services/mail.js';

const logQuery = z.object({
  status: z.enum(['queued', 'sent', 'retrying', 'failed']).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  order: z.enum(['asc', 'desc']).default('desc'),
});
const mailboxQuery = z.object({
  to: z.string().trim().max(200).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});

/** Admins: the delivery log of every mail, and the mailbox of the configured mail catcher (MAILBOX_URL). */
export function mailboxRouter(ctx: AppContext) {
  const router = Router();
  router.use('/mail', requireRole('admin'));

  router.get('/mail/log', async (req, res) => {
    const q = parseInput(logQuery, req.query, 'query');
    res.json({ ...(await listMailLog(ctx.db, q)), page: q.page, pageSize: q.pageSize });
  });

  router.get('/mail/mailbox', async (req, res) => {
    const q = parseInput(mailboxQuery, req.query, 'query');
    if (!ctx.env.MAILBOX_URL) throw new AppError(503, 'mailbox_unconfigured', 'No mailbox is configured (set MAILBOX_URL to the mail catcher).');
    const url = new URL('/messages', ctx.env.MAILBOX_URL);
    if (q.to) url.searchParams.set('to', q.to);
    let body: { messages: unknown[]; total: number };
    try {
      const r = await fetch(url, { signal: AbortSignal.timeout(5000) });
      if (!r.ok) throw new Error(`answered ${r.status}`);
      body = (await r.json()) as typeof body;
    } catch (err) {
      throw new AppError(502, 'mailbox_unreachable', `The mailbox at ${ctx.env.MAILBOX_URL} could not be read: ${(err as Error).message}`);
    }
    const start = (q.page - 1) * q.pageSize;
    res.json({ items: body.messages.slice(start, start + q.pageSize), total: body.messages.length, page: q.page, pageSize: q.pageSize });
  });

  return router;
}
