// Starts every local stand-in for a hosted service on loopback, on the ports given by the environment.
import type { Server } from 'node:http';
import { startOAuthProvider } from './oauth-provider.js';
import { startSearchIndex } from './search-index.js';
import { startDoiResolver } from './doi-resolver.js';
import { startFakeSmtp } from './smtp.js';

export interface FakePorts {
  oauth: number;
  meili: number;
  doi: number;
  smtp: number;
  mailbox: number;
}

export function fakePortsFromEnv(env: NodeJS.ProcessEnv = process.env): FakePorts {
  const n = (name: string) => {
    const v = Number(env[name]);
    if (!Number.isInteger(v) || v <= 0) throw new Error(`${name} must be set to a port number`);
    return v;
  };
  return { oauth: n('FAKE_OAUTH_PORT'), meili: n('FAKE_MEILI_PORT'), doi: n('FAKE_DOI_PORT'), smtp: n('FAKE_SMTP_PORT'), mailbox: n('FAKE_MAILBOX_PORT') };
}

export interface RunningFakes {
  stop(): Promise<void>;
}

export async function startFakes(ports: FakePorts): Promise<RunningFakes> {
  const closers: Array<() => Promise<void>> = [];
  const track = (server: Server) => closers.push(() => new Promise<void>((r) => server.close(() => r())));

  track(await startOAuthProvider(ports.oauth));
  // Other stand-ins register here (search index, DOI resolver, SMTP + mailbox).
  track(await startSearchIndex(ports.meili));
  const doiResolver = await startDoiResolver(ports.doi);
  // The resolver holds deliberately slow requests open: drop them on stop.
  closers.push(() => new Promise<void>((r) => (doiResolver.close(() => r()), doiResolver.closeAllConnections())));
  const mail = await startFakeSmtp(ports.smtp, ports.mailbox);
  track(mail.mailbox);
  closers.push(() => new Promise<void>((r) => mail.smtp.close(() => r())));

  return {
    async stop() {
      await Promise.all(closers.map((c) => c()));
    },
  };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const ports = fakePortsFromEnv();
  const fakes = await startFakes(ports);
  console.log(`Local stand-ins on 127.0.0.1: OAuth ${ports.oauth}, search ${ports.meili}, DOI ${ports.doi}, SMTP ${ports.smtp}, mailbox ${ports.mailbox}`);
  const stop = () => fakes.stop().finally(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
