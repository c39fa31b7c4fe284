import { Router } from 'express';
import { mailboxQuerySchema, mailLogQuerySchema } from '../../shared/schemas/admin.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { listMailLog, resendMail } from '../services/mail.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { readMailbox } from '../services/mailbox.js';

/** Admins: the delivery log of every mail (and resending a failed one), and the mailbox of the configured mail catcher (MAILBOX_URL). */
export function mailboxRouter(ctx: AppContext) {
  const router = Router();
  router.use('/mail', requireRole('admin'));

  router.get('/mail/log', async (req, res) => {
    res.json(await listMailLog(ctx.db, parseInput(mailLogQuerySchema, req.query, 'query')));
  });

  router.post('/mail/:id/resend', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await resendMail(ctx, req.user!.id, id));
  });

  router.get('/mail/mailbox', async (req, res) => {
    res.json(await readMailbox(ctx.env.MAILBOX_URL, parseInput(mailboxQuerySchema, req.query, 'query')));
  });

  return router;
}
