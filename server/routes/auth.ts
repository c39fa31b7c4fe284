import { Router } from 'express';
import type { createPassport } from '../auth/passport.js';
import type { AppContext } from '../context.js';
import { perMinuteLimit } from '../lib/rate-limit.js';
import { providerDownPage, providerProbe } from '../auth/provider-probe.js';

/**
 * Where to go after sign-in: only a path on this site. Parsed with `new URL` against the app's origin, so
 * `//host`, `/\\host`, `https://host` and the like (which a browser reads as another host) are dropped.
 */
export function safeReturnTo(value: unknown, appOrigin: string): string | undefined {
  if (typeof value !== 'string' || value.length > 500 || !value.startsWith('/') || [...value].some((c) => c <= ' ' || c === '\\')) return undefined;
  let url: URL;
  try {
    url = new URL(value, appOrigin);
  } catch {
    return undefined;
  }
  if (url.origin !== new URL(appOrigin).origin) return undefined;
  return `${url.pathname}${url.search}${url.hash}`;
}

/** The OAuth web flow at passport's usual paths: /auth/github → provider → /auth/github/callback. */
export function authRouter(ctx: AppContext, passport: ReturnType<typeof createPassport>) {
  const router = Router();
  router.use(perMinuteLimit(ctx.env.AUTH_RATE_LIMIT_PER_MINUTE, 'Too many sign-in attempts; wait a minute and try again.'));

  const providerUp = providerProbe(ctx.env.GITHUB_AUTHORIZATION_URL);

  // A provider that does not answer gets a page that says so, not a redirect to an error (and no session).
  router.get('/github', async (req, res, next) => {
    const returnTo = safeReturnTo(req.query.returnTo, ctx.env.APP_ORIGIN);
    if (!(await providerUp())) {
      res.status(503).set('Retry-After', '30').type('html').send(providerDownPage(returnTo ?? '/'));
      return;
    }
    if (returnTo && req.session) (req.session as { returnTo?: string }).returnTo = returnTo;
    passport.authenticate('github')(req, res, next);
  });

  router.get('/github/callback', (req, res, next) => {
    passport.authenticate('github', (err: unknown, user: Express.User | false) => {
      if (err) return next(err);
      if (!user) return res.redirect('/?signin=failed');
      const returnTo = safeReturnTo((req.session as { returnTo?: string }).returnTo, ctx.env.APP_ORIGIN) ?? '/';
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
