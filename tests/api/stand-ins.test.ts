import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import net from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { freePorts } from '../support/ports.js';
import { startStandIns } from '../support/stand-ins.js';

const run = promisify(execFile);
const sh = (script: string) => run('bash', ['-c', `set -e; ${script}`], { timeout: 120_000 }).then((r) => r.stdout.trim());

const smtpGreets = (port: number) =>
  new Promise<string>((resolve, reject) => {
    const s = net.connect(port, '127.0.0.1');
    s.once('data', (d) => (resolve(String(d)), s.destroy()));
    s.once('error', reject);
  });

describe('the start scripts keep the parts apart', () => {
  it('runs each stand-in in its own process: one killed, the others still answer', async () => {
    const [oauth, meili, doi, smtp, mailbox] = await freePorts(5);
    const env = { ...process.env, FAKE_OAUTH_PORT: String(oauth), FAKE_MEILI_PORT: String(meili), FAKE_DOI_PORT: String(doi), FAKE_SMTP_PORT: String(smtp), FAKE_MAILBOX_PORT: String(mailbox) };
    const fakes = await startStandIns(env);
    try {
      const pids = new Set(Object.values(fakes.processes).map((p) => p.pid));
      expect(pids.size).toBe(4);
      expect((await fetch(`http://127.0.0.1:${doi}/health`)).status).toBe(200);
      const gone = new Promise((r) => fakes.processes.doi.once('exit', r));
      fakes.processes.doi.kill('SIGKILL');
      await gone;
      await expect(fetch(`http://127.0.0.1:${doi}/health`)).rejects.toThrow();
      for (const port of [oauth, meili, mailbox]) expect((await fetch(`http://127.0.0.1:${port}/health`)).status).toBe(200);
      expect(await smtpGreets(smtp)).toMatch(/^220 /);
    } finally {
      await fakes.stop();
    }
  }, 60_000);

  it('starts the PostgreSQL of npm start with fsync on (durable), test clusters with it off', async () => {
    const [a, b] = await freePorts(2);
    const name = `fsync-${process.pid}`;
    const out = await sh(
      `source scripts/pg.sh; pg_install_if_missing
       pg_up ${name}-d ${a} >&2; d=$("$PGBIN/psql" -h 127.0.0.1 -p ${a} -U postgres -tAc 'SHOW fsync'); pg_down; rm -rf "$PG_CLUSTER_DIR"
       pg_up ${name}-s ${b} scratch >&2; s=$("$PGBIN/psql" -h 127.0.0.1 -p ${b} -U postgres -tAc 'SHOW fsync'); pg_down; rm -rf "$PG_CLUSTER_DIR"
       echo "$d $s"`,
    );
    expect(out.split('\n').pop()).toBe('on off');
    // npm start asks for the default (durable) cluster.
    expect(readFileSync('scripts/start.sh', 'utf8')).toMatch(/pg_up dev "\$PG_PORT"\n/);
  }, 120_000);

  it('restarts a supervised process that crashes, and stops it on request', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'supervise-'));
    try {
      await sh(
        `source scripts/supervise.sh
         supervise crasher "${dir}/log" bash -c 'echo start >> "${dir}/starts"; exit 3'
         sleep 4; stop_supervised; wc -l < "${dir}/starts" > "${dir}/count"`,
      );
      const starts = Number(readFileSync(join(dir, 'count'), 'utf8').trim());
      expect(starts).toBeGreaterThanOrEqual(2);
      expect(starts).toBeLessThanOrEqual(4);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
    // npm start and npm run dev both start every stand-in under it
    for (const script of ['scripts/start.sh', 'scripts/dev.sh']) {
      const text = readFileSync(script, 'utf8');
      expect(text, script).toMatch(/^source scripts\/supervise\.sh$/m);
      expect(text, script).toMatch(/for fake in oauth search doi mail; do\n\s+supervise "\$fake stand-in" "[^"]+" node_modules\/\.bin\/tsx server\/fakes\/run\.ts "\$fake"\ndone/);
      expect(text, script).not.toMatch(/run\.ts "\$fake" &/);
    }
  }, 30_000);
});
