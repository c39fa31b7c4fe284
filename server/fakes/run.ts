// Starts every local stand-in for a hosted service on loopback, on the ports given by the environment.
import type { Server } from 'node:http';
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { startOAuthProvider } from './oauth-provider.js';
import { startSearchIndex } from './search-index/http.js';
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

export const FAKE_NAMES = ['oauth', 'search', 'doi', 'mail'] as const;
export type FakeName = (typeof FAKE_NAMES)[number];

type Closer = () => Promise<void>;
// Open keep-alive connections (a browser's, the app's) would keep a stopped stand-in answering: drop them too.
const closeServer = (server: Server): Closer => () => new Promise<void>((r) => (server.close(() => r()), server.closeAllConnections()));

/** Starts one stand-in; returns what stops it. */
async function startFake(name: FakeName, ports: FakePorts): Promise<Closer[]> {
  switch (name) {
    case 'oauth':
      return [closeServer(await startOAuthProvider(ports.oauth))];
    case 'search':
      return [closeServer(await startSearchIndex(ports.meili))];
    case 'doi': {
      // The resolver holds deliberately slow requests open: closeServer drops them.
      return [closeServer(await startDoiResolver(ports.doi))];
    }
    case 'mail': {
      const mail = await startFakeSmtp(ports.smtp, ports.mailbox);
      return [closeServer(mail.mailbox), () => new Promise<void>((r) => mail.smtp.close(() => r()))];
    }
  }
}

/** Starts the named stand-ins (all by default) in this process. */
export async function startFakes(ports: FakePorts, names: readonly FakeName[] = FAKE_NAMES): Promise<RunningFakes> {
  const closers: Closer[] = [];
  for (const name of names) closers.push(...(await startFake(name, ports)));
  return {
    async stop() {
      await Promise.all(closers.map((c) => c()));
    },
  };
}

// `tsx server/fakes/run.ts [oauth|search|doi|mail ...]`: the named stand-ins (all when none is named).
// The start scripts run each in its own process, so one failing does not take the others down.
if (import.meta.url === `file://${process.argv[1]}`) {
  const ports = fakePortsFromEnv();
  const asked = process.argv.slice(2);
  const unknown = asked.filter((n) => !(FAKE_NAMES as readonly string[]).includes(n));
  if (unknown.length) {
    console.error(`Unknown stand-in ${unknown.join(', ')}; choose from ${FAKE_NAMES.join(', ')}.`);
    process.exit(2);
  }
  const names = asked.length ? (asked as FakeName[]) : FAKE_NAMES;
  const fakes = await startFakes(ports, names);
  const where: Record<FakeName, string> = {
    oauth: `OAuth ${ports.oauth}`,
    search: `search ${ports.meili}`,
    doi: `DOI ${ports.doi}`,
    mail: `SMTP ${ports.smtp}, mailbox ${ports.mailbox}`,
  };
  console.log(`Local stand-in on 127.0.0.1: ${names.map((n) => where[n]).join(', ')}`);
  // Under the browser tests each stand-in says its own pid (not its launcher's), so a spec can stop exactly it.
  if (process.env.STAND_IN_DIR && names.length === 1) writeFileSync(path.join(process.env.STAND_IN_DIR, `${names[0]}.pid`), String(process.pid));
  const stop = () => fakes.stop().finally(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
