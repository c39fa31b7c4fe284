import { execFile } from 'node:child_process';
import { rmSync } from 'node:fs';
import { promisify } from 'node:util';

const run = promisify(execFile);

/** Runs a bash snippet with scripts/pg.sh loaded and the cluster's variables set. */
async function pgShell(script: string, vars: Record<string, string> = {}) {
  const { stdout } = await run('bash', ['-c', `set -e; source scripts/pg.sh; pg_install_if_missing; ${script}`], {
    env: { ...process.env, ...vars },
    timeout: 120_000,
  });
  return stdout;
}

export interface PrivatePostgres {
  url: string;
  /** `pg_ctl restart -m fast`: ends every connection, comes back on the same port. */
  restart(): Promise<void>;
  stop(): Promise<void>;
}

/** A throw-away PostgreSQL cluster of its own (scripts/pg.sh, scratch durability) with one empty database. */
export async function startPrivatePostgres(name: string, port: number): Promise<PrivatePostgres> {
  const out = await pgShell(`pg_up "$N" "$P" scratch >&2; pg_create_db chronometa_test_private; echo "$PG_CLUSTER_DIR"`, { N: name, P: String(port) });
  const clusterDir = out.trim().split('\n').pop()!;
  const vars = { PGDATA: `${clusterDir}/data`, LOG: `${clusterDir}/postgres.log`, PG_CLUSTER_DIR: clusterDir };
  return {
    url: `postgres://postgres@127.0.0.1:${port}/chronometa_test_private`,
    restart: async () => {
      await pgShell('as_pg "$PGBIN/pg_ctl" -D "$PGDATA" -l "$LOG" -m fast -w -t 60 restart >/dev/null', vars);
    },
    stop: async () => {
      await pgShell('pg_down', vars).catch(() => undefined);
      rmSync(clusterDir, { recursive: true, force: true });
    },
  };
}


