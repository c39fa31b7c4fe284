import { Router } from 'express';
import type { createPassport } from '../auth/passport.js';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { perMinuteLimit } from '../lib/rate-limit.js';

const returnToSchema = z
  .string()
  .regex(/^\/(?!\/)[^\s]*$/, 'must be a path on this site')
  .max(500)
  .optional();

/** The OAuth web flow at passport's usual paths: /auth/github → provider → /auth/github/callback. */
export function authRouter(ctx: AppContext, passport: ReturnType<typeof createPassport>) {
  const router = Router();
  router.use(perMinuteLimit(ctx.env.AUTH_RATE_LIMIT_PER_MINUTE, 'Too many sign-in attempts; wait a minute and try again.'));

  router.get('/github', (req, res, next) => {
    const returnTo = returnToSchema.safeParse(req.query.returnTo);
    if (returnTo.success && returnTo.data && req.session) (req.session as { returnTo?: string }).returnTo = returnTo.data;
    passport.authenticate('github')(req, res, next);
  });

  router.get('/github/callback', (req, res, next) => {
    passport.authenticate('github', (err: unknown, user: Express.User | false) => {
      if (err) return next(err);
      if (!user) return res.redirect('/?signin=failed');
      const returnTo = (req.session as { returnTo?: string }).returnTo ?? '/';
      // req.login regenerates the session (passport 0.6+), which defeats session fixation.
      req.login(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        res.redirect(returnTo);
      });
    })(req, res, next);
  });

  router.post('/logout', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy(() => {
        res.clearCookie('chronometa.sid');
        res.status(204).end();
      });
    });
  });

  return router;
}
