// Stops and starts one local stand-in of the running browser-test instance (scripts/test.sh keeps each one's pid
// in STAND_IN_DIR), so a spec can walk a path while that service is away.
import { spawn } from 'node:child_process';
import { openSync, readFileSync } from 'node:fs';
import path from 'node:path';
import type { FakeName } from '../../server/fakes/run.js';

const HEALTH: Record<FakeName, () => string> = {
  oauth: () => `http://127.0.0.1:${process.env.FAKE_OAUTH_PORT}/health`,
  search: () => `${process.env.MEILI_HOST}/health`,
  doi: () => `${process.env.DOI_RESOLVER_URL}/health`,
  mail: () => `${process.env.MAILBOX_URL}/health`,
};

function pidFile(name: FakeName) {
  const dir = process.env.STAND_IN_DIR;
  if (!dir) throw new Error('STAND_IN_DIR is not set: run the browser tests with `npm test` (scripts/test.sh).');
  return path.join(dir, `${name}.pid`);
}

const answers = (url: string) =>
  fetch(url, { signal: AbortSignal.timeout(1000) }).then(
    (r) => r.ok,
    () => false,
  );

async function until(what: string, check: () => Promise<boolean>, timeoutMs = 15_000) {
  const end = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`timed out waiting until ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

/** Stops the stand-in (the pid it wrote itself on start) and waits until its process has ended and its port is quiet. */
export async function stopStandIn(name: FakeName): Promise<void> {
  const pid = Number(readFileSync(pidFile(name), 'utf8'));
  if (!alive(pid)) throw new Error(`the ${name} stand-in's pid file names process ${pid}, which is not running`);
  process.kill(pid, 'SIGTERM');
  await until(`the ${name} stand-in (process ${pid}) has ended`, async () => !alive(pid));
  await until(`the ${name} stand-in is away`, async () => !(await answers(HEALTH[name]())));
}

/** Starts the stand-in again in its own process (output to the run's fakes.log) and waits until it answers and has written its pid. */
export async function startStandIn(name: FakeName): Promise<void> {
  const file = pidFile(name);
  const log = openSync(path.join(path.dirname(file), '..', 'fakes.log'), 'a');
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/fakes/run.ts', name], { stdio: ['ignore', log, log], detached: true });
  child.unref();
  await until(`the ${name} stand-in answers`, async () => Number(readFileSync(file, 'utf8')) === child.pid && (await answers(HEALTH[name]())));
}
