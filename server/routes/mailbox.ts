import { Router } from 'express';
import { mailboxQuerySchema, mailLogQuerySchema } from '../../shared/schemas/admin.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { listMailLog } from '../services/mail.js';
import { readMailbox } from '../services/mailbox.js';

/** Admins: the delivery log of every mail, and the mailbox of the configured mail catcher (MAILBOX_URL). */
export function mailboxRouter(ctx: AppContext) {
  const router = Router();
  router.use('/mail', requireRole('admin'));

  router.get('/mail/log', async (req, res) => {
    res.json(await listMailLog(ctx.db, parseInput(mailLogQuerySchema, req.query, 'query')));
  });

  router.get('/mail/mailbox', async (req, res) => {
    res.json(await readMailbox(ctx.env.MAILBOX_URL, parseInput(mailboxQuerySchema, req.query, 'query')));
  });

  return router;
}
