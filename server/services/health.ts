import net from 'node:net';
import type { Knex } from 'knex';
import type { Health } from '../../shared/schemas/admin.js';
import type { Env } from '../env.js';
import { ping } from '../repositories/health.js';

type PartState = { state: 'up' | 'down' | 'not configured'; ms?: number; message?: string };

async function timed(check: () => Promise<void>): Promise<PartState> {
  const start = performance.now();
  try {
    await check();
    return { state: 'up', ms: Math.round(performance.now() - start) };
  } catch (err) {
    return { state: 'down', ms: Math.round(performance.now() - start), message: (err as Error).message };
  }
}

/** Each part gets this long, so the whole check answers within about 1.5 s even with the database away. */
const PART_TIMEOUT_MS = 1500;

function withinTime(work: Promise<void>, timeoutMs = PART_TIMEOUT_MS): Promise<void> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer within ${timeoutMs} ms`)), timeoutMs);
  });
  return Promise.race([work, late]).finally(() => clearTimeout(timer));
}

async function httpReachable(url: string, timeoutMs = PART_TIMEOUT_MS) {
  try {
    const res = await fetch(url, { signal: AbortSignal.timeout(timeoutMs), redirect: 'manual' });
    await res.body?.cancel();
  } catch (err) {
    const cause = (err as { cause?: { code?: string } }).cause?.code ?? (err as Error).message;
    throw new Error(`${new URL(url).origin} cannot be reached (${cause})`);
  }
}

function smtpGreets(host: string, port: number, timeoutMs = PART_TIMEOUT_MS) {
  return new Promise<void>((resolve, reject) => {
    const socket = net.connect({ host, port });
    const fail = (err: Error) => {
      socket.destroy();
      reject(err);
    };
    socket.setTimeout(timeoutMs, () => fail(new Error('timed out')));
    socket.once('error', fail);
    socket.once('data', (chunk) => {
      socket.end('QUIT\r\n');
      if (String(chunk).startsWith('220')) resolve();
      else reject(new Error(`unexpected greeting ${String(chunk).slice(0, 40)}`));
    });
  });
}

const notConfigured = Promise.resolve<PartState>({ state: 'not configured' });

/** Whether the database and each configured outside service answer; the app is unavailable without its database. */
export async function checkHealth(deps: { db: Knex; env: Env }): Promise<{ available: boolean; body: Health }> {
  const { env } = deps;
  const [database, search, mail, oauth, doi] = await Promise.all([
    timed(() => withinTime(ping(deps.db))),
    env.MEILI_HOST ? timed(() => httpReachable(new URL('/health', env.MEILI_HOST).toString())) : notConfigured,
    env.SMTP_HOST && env.SMTP_PORT ? timed(() => smtpGreets(env.SMTP_HOST!, env.SMTP_PORT!)) : notConfigured,
    timed(() => httpReachable(new URL(env.GITHUB_AUTHORIZATION_URL).origin)),
    timed(() => httpReachable(new URL(env.DOI_RESOLVER_URL).origin)),
  ]);
  const parts = { database, search, mail, oauth, doi };
  const allUp = Object.values(parts).every((p) => p.state !== 'down');
  return { available: database.state === 'up', body: { status: database.state !== 'up' ? 'unavailable' : allUp ? 'ok' : 'degraded', parts } };
}
