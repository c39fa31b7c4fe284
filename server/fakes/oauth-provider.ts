import express from 'express';
import { randomBytes } from 'node:crypto';
import type { Server } from 'node:http';
import { FAKE_IDENTITIES, type FakeIdentity } from './identities.js';

/**
 * A loopback stand-in for GitHub's OAuth web flow: authorize → code → access token → user and e-mails.
 * A person picks an identity on its page; scripts pass `login=<name>` on the authorize URL.
 */
export function createOAuthProvider(identities: FakeIdentity[] = FAKE_IDENTITIES) {
  const codes = new Map<string, { login: string; redirectUri: string; clientId: string }>();
  const tokens = new Map<string, string>();
  const app = express();
  app.use(express.urlencoded({ extended: false }));
  app.use(express.json());

  const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

  app.get('/health', (_req, res) => {
    res.json({ status: 'ok' });
  });

  app.get('/login/oauth/authorize', (req, res) => {
    const clientId = String(req.query.client_id ?? '');
    const redirectUri = String(req.query.redirect_uri ?? '');
    const state = req.query.state === undefined ? undefined : String(req.query.state);
    const login = req.query.login === undefined ? undefined : String(req.query.login);
    if (!clientId || !redirectUri) {
      res.status(400).send('client_id and redirect_uri are required');
      return;
    }
    if (login !== undefined) {
      const who = identities.find((i) => i.login === login);
      if (!who) {
        res.status(404).send(`No identity with login ${escape(login)}`);
        return;
      }
      const code = randomBytes(12).toString('hex');
      codes.set(code, { login: who.login, redirectUri, clientId });
      const target = new URL(redirectUri);
      target.searchParams.set('code', code);
      if (state !== undefined) target.searchParams.set('state', state);
      res.redirect(302, target.toString());
      return;
    }
    const base = new URLSearchParams(req.query as Record<string, string>);
    const items = identities
      .map((i) => {
        const q = new URLSearchParams(base);
        q.set('login', i.login);
        return `<li><a href="/login/oauth/authorize?${escape(q.toString())}"><strong>${escape(i.name)}</strong> <code>@${escape(i.login)}</code></a><br><small>${escape(i.lab)}</small></li>`;
      })
      .join('');
    res.type('html').send(`<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Local sign-in stand-in</title>
<style>body{font-family:system-ui,sans-serif;max-width:36rem;margin:3rem auto;color:#222}li{margin:.6rem 0}a{color:#333}</style></head>
<body><h1>Local sign-in stand-in</h1><p>This development server plays the part of the OAuth provider. Choose who to sign in as.</p><ul>${items}</ul></body></html>`);
  });

  app.post('/login/oauth/access_token', (req, res) => {
    const body = { ...req.query, ...req.body } as Record<string, string>;
    const entry = codes.get(String(body.code ?? ''));
    const wantsJson = String(req.headers.accept ?? '').includes('json');
    const reply = (payload: Record<string, string>) =>
      wantsJson ? res.json(payload) : res.type('application/x-www-form-urlencoded').send(new URLSearchParams(payload).toString());
    if (!entry || entry.clientId !== body.client_id) {
      reply({ error: 'bad_verification_code', error_description: 'The code passed is incorrect or expired.' });
      return;
    }
    codes.delete(String(body.code));
    const token = `fake_${randomBytes(16).toString('hex')}`;
    tokens.set(token, entry.login);
    reply({ access_token: token, token_type: 'bearer', scope: 'read:user,user:email' });
  });

  const whoIs = (req: express.Request) => {
    const header = String(req.headers.authorization ?? '');
    const token = header.replace(/^(token|bearer)\s+/i, '');
    const login = tokens.get(token);
    return login ? identities.find((i) => i.login === login) : undefined;
  };

  app.get('/api/user', (req, res) => {
    const who = whoIs(req);
    if (!who) {
      res.status(401).json({ message: 'Bad credentials' });
      return;
    }
    res.json({ id: who.id, login: who.login, name: who.name, email: who.email, avatar_url: null, html_url: null, type: 'User' });
  });

  app.get('/api/user/emails', (req, res) => {
    const who = whoIs(req);
    if (!who) {
      res.status(401).json({ message: 'Bad credentials' });
      return;
    }
    res.json([{ email: who.email, primary: true, verified: true, visibility: 'private' }]);
  });

  return app;
}

export async function startOAuthProvider(port: number, host = '127.0.0.1'): Promise<Server> {
  const app = createOAuthProvider();
  return new Promise((resolve) => {
    const server = app.listen(port, host, () => resolve(server));
  });
}
