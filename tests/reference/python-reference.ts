import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

/** Debian's interpreter, which has python3-statsmodels and scipy (not the python3 first on PATH). */
export const REFERENCE_PYTHON = '/usr/bin/python3';

const here = path.dirname(fileURLToPath(import.meta.url));

/**
 * Runs one of the reference scripts in this folder with `input` as JSON on stdin and returns its JSON
 * output. Never skips: a missing interpreter or library is an error that says how to install it.
 */
export function runReference<T>(script: string, input: unknown): T {
  const res = spawnSync(REFERENCE_PYTHON, [path.join(here, script)], {
    input: JSON.stringify(input),
    encoding: 'utf8',
    maxBuffer: 512 * 1024 * 1024,
  });
  if (res.error || res.status !== 0) {
    throw new Error(
      `reference script ${script} failed under ${REFERENCE_PYTHON}: ${res.error?.message ?? res.stderr}\n` +
        'These checks need Debian\'s statsmodels and scipy: apt-get install -y python3-statsmodels',
    );
  }
  return JSON.parse(res.stdout) as T;
}

/** |actual − expected| ≤ tol·max(|expected|, scale); scale = 0 demands an exact 0 when 0 is expected. */
export function relErr(actual: number, expected: number, scale = 0): number {
  const d = Math.abs(actual - expected);
  if (d === 0) return 0;
  return d / Math.max(Math.abs(expected), scale);
}
