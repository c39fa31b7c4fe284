import express, { type Router } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import compression from 'compression';
import { existsSync } from 'node:fs';
import path from 'node:path';
import type { AppContext } from './context.js';
import { createPassport } from './auth/passport.js';
import { bearerAuth, bearerToken } from './auth/api-tokens.js';
import { originCheck } from './auth/origin-check.js';
import { errorHandler, notFoundApi } from './lib/error-handler.js';
import { budgetGate, CallerBudget } from './lib/caller-budget.js';
import { authRouter } from './routes/auth.js';
import { healthRouter } from './routes/health.js';
import { meRouter } from './routes/me.js';
import { adminRouter } from './routes/admin.js';
import { auditRouter } from './routes/audit.js';
import { tokensRouter } from './routes/tokens.js';
import { synthesesRouter } from './routes/syntheses.js';
import { followsRouter } from './routes/follows.js';
import { snapshotsRouter } from './routes/snapshots.js';
import { atlasRouter } from './routes/atlas.js';
import { importsBodyRouter, importsRouter } from './routes/imports.js';
import { referencesRouter } from './routes/references.js';
import { screeningRouter } from './routes/screening.js';
import { duplicatesRouter } from './routes/duplicates.js';
import { searchRouter } from './routes/search.js';
import { effectsRouter } from './routes/effects.js';
import { manipulationsRouter } from './routes/manipulations.js';
import { extractionsRouter } from './routes/extractions.js';
import { assignmentsRouter } from './routes/assignments.js';
import { reconciliationRouter } from './routes/reconciliation.js';
import { agreementRouter } from './routes/agreement.js';
import { mailboxRouter } from './routes/mailbox.js';
import { computeRouter } from './routes/compute.js';
import { trialsRouter } from './routes/trials.js';


/** Builds the Express app without listening, so tests can mount it with supertest. */
export function buildApp(ctx: AppContext) {
  const { env } = ctx;
  const clientDir = path.resolve(env.CLIENT_DIR);
  const app = express();
  app.set('trust proxy', env.TRUST_PROXY);
  app.disable('x-powered-by');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          styleSrc: ["'self'", "'unsafe-inline'"],
          scriptSrc: ["'self'"],
          connectSrc: ["'self'"],
          fontSrc: ["'self'", 'data:'],
          formAction: ["'self'", new URL(env.GITHUB_AUTHORIZATION_URL).origin],
          upgradeInsecureRequests: env.APP_ORIGIN.startsWith('https') ? [] : null,
        },
      },
      hsts: env.APP_ORIGIN.startsWith('https'),
    }),
  );

  // gzip (or deflate) for callers that accept it, above 1 kB; zlib runs off the event loop, in libuv's pool.
  app.use(compression({ threshold: 1024 }));

  // A Bearer token is checked before any router (the early ones too), so a revoked token is refused everywhere.
  app.use(bearerAuth(ctx.db));

  const sessionMiddleware = session({
    name: 'chronometa.sid',
    secret: env.SESSION_SECRET,
    store: ctx.sessionStore,
    resave: false,
    saveUninitialized: false,
    cookie: { httpOnly: true, sameSite: 'lax', secure: env.APP_ORIGIN.startsWith('https'), maxAge: 14 * 24 * 3600 * 1000 },
  });
  const passport = createPassport(env, ctx.db);
  const initialize = passport.initialize();
  const restore = passport.session();
  // A Bearer request is authenticated by its token alone and never touches the session.
  app.use((req, res, next) => {
    if (bearerToken(req.headers.authorization)) return next();
    // A signed-out request without a cookie has no session to restore; only sign-in needs a fresh one.
    if (!req.headers.cookie && !req.path.startsWith('/auth/')) return next();
    sessionMiddleware(req, res, (err?: unknown) => {
      if (err) return next(err);
      initialize(req, res, () => restore(req, res, next));
    });
  });
  // The caller is known from here on (session or token), so one budget covers every API route, the early ones too.
  app.use('/api', budgetGate(new CallerBudget(env.CALLER_BUDGET_PER_MINUTE), (req) => req.path === '/health'));
  // Routers that need larger bodies (bulk compute, uploads) mount their own parsers before this one.
  for (const mount of earlyApiRouters) app.use('/api', mount(ctx));
  app.use(express.json({ limit: '2mb' }));
  app.use(express.urlencoded({ extended: false, limit: '1mb' }));
  app.use(originCheck([env.APP_ORIGIN, ...extraOrigins(env)]));

  app.use('/auth', authRouter(ctx, passport));
  for (const mount of apiRouters) app.use('/api', mount(ctx));
  app.use('/api', notFoundApi);

  if (existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h', dotfiles: 'allow' }));
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(clientDir, 'index.html'), { dotfiles: 'allow' }));
  }
  app.use(errorHandler(env.NODE_ENV === 'development'));
  return app;
}

function extraOrigins(env: AppContext['env']): string[] {
  return env.NODE_ENV === 'development' ? ['http://127.0.0.1:5173', 'http://localhost:5173'] : [];
}

type MountRouter = (ctx: AppContext) => Router;

/** Routers with their own body parsers (mounted before the default JSON parser). */
const earlyApiRouters: MountRouter[] = [
  // feature routers with large bodies go here
  importsBodyRouter,
  computeRouter,
];

/** Every API router, mounted under /api. Add a feature's router to this list. */
const apiRouters: MountRouter[] = [
  healthRouter,
  meRouter,
  adminRouter,
  auditRouter,
  tokensRouter,
  synthesesRouter,
  snapshotsRouter,
  followsRouter,
  atlasRouter,
  importsRouter,
  referencesRouter,
  screeningRouter,
  duplicatesRouter,
  searchRouter,
  effectsRouter,
  manipulationsRouter,
  extractionsRouter,
  assignmentsRouter,
  reconciliationRouter,
  agreementRouter,
  mailboxRouter,
  trialsRouter,
];
