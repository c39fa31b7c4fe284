import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

const here = path.dirname(fileURLToPath(import.meta.url));

/**
 * Runs one of the R scripts in this folder with `args` and returns its JSON output. Never skips: a missing
 * R or package is an error that says how to install it.
 */
export function runR<T>(script: string, args: string[]): T {
  const res = spawnSync('Rscript', ['--vanilla', path.join(here, script), ...args], {
    encoding: 'utf8',
    maxBuffer: 512 * 1024 * 1024,
  });
  if (res.error || res.status !== 0) {
    throw new Error(
      `reference script ${script} failed: ${res.error?.message ?? res.stderr}\n` +
        "These checks need R with metafor and clubSandwich: apt-get install -y --no-install-recommends r-cran-metafor r-cran-clubsandwich",
    );
  }
  return JSON.parse(res.stdout) as T;
}
