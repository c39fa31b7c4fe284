import { z } from 'zod';

const optionalUrl = z.url().optional();

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  APP_ORIGIN: z.url().optional(),
  DATABASE_URL: z.string().regex(/^postgres(ql)?:\/\//, 'must be a postgres:// connection URL'),
  SESSION_SECRET: z.string().min(16, 'must be at least 16 characters'),
  TRUST_PROXY: z.coerce.number().int().min(0).default(0),
  GITHUB_CLIENT_ID: z.string().min(1),
  GITHUB_CLIENT_SECRET: z.string().min(1),
  GITHUB_AUTHORIZATION_URL: z.url().default('https://github.com/login/oauth/authorize'),
  GITHUB_TOKEN_URL: z.url().default('https://github.com/login/oauth/access_token'),
  GITHUB_USER_PROFILE_URL: z.url().default('https://api.github.com/user'),
  GITHUB_USER_EMAIL_URL: z.url().default('https://api.github.com/user/emails'),
  ADMIN_LOGINS: z.string().default(''),
  AUTH_RATE_LIMIT_PER_MINUTE: z.coerce.number().int().min(1).default(120),
  /** cost units each caller may spend a minute across the API (a cheap read is 1; server/lib/caller-budget.ts) */
  CALLER_BUDGET_PER_MINUTE: z.coerce.number().int().min(1).default(3000),
  MEILI_HOST: optionalUrl,
  MEILI_API_KEY: z.string().optional(),
  DOI_RESOLVER_URL: z.url().default('https://doi.org'),
  DOI_TIMEOUT_MS: z.coerce.number().int().min(100).default(8000),
  SMTP_HOST: z.string().optional(),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).optional(),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: z.enum(['true', 'false']).default('false'),
  MAIL_FROM: z.string().default('Chronometa <registry@chronometa.invalid>'),
  MAILBOX_URL: optionalUrl,
  UPLOAD_DIR: z.string().default('.data/uploads'),
  CLIENT_DIR: z.string().default('dist/client'),
  JOBS_ENABLED: z.enum(['true', 'false']).default('true'),
  /** how often expired sessions are deleted, in seconds (0: never); unset, every 15 minutes, and never under test */
  SESSION_PRUNE_SECONDS: z.coerce.number().int().min(0).optional(),
});

export type Env = z.infer<typeof envSchema> & { APP_ORIGIN: string; adminLogins: string[] };

export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  - ${i.path.join('.') || '(root)'}: ${i.message}`);
    throw new Error(`Chronometa cannot start: the environment is not valid.\n${lines.join('\n')}`);
  }
  const env = parsed.data;
  return {
    ...env,
    APP_ORIGIN: env.APP_ORIGIN ?? `http://${env.HOST}:${env.PORT}`,
    adminLogins: env.ADMIN_LOGINS.split(',').map((s) => s.trim().toLowerCase()).filter(Boolean),
  };
}
