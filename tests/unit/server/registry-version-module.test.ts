import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(__dirname, '../../..');
function files(dir: string, ext: RegExp): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? files(p, ext) : ext.test(name) ? [p] : [];
  });
}

describe('the registry version has one writer and one reader', () => {
  it('only server/repositories/registry-version.ts touches registry_changes', () => {
    const touching = files(join(root, 'server'), /\.ts$/)
      .filter((p) => readFileSync(p, 'utf8').includes('registry_changes'))
      .map((p) => relative(root, p));
    expect(touching).toEqual(['server/repositories/registry-version.ts']);
  });

  it('client mutations of settled data invalidate what is computed from it', () => {
    // endpoints whose success changes what settled data shows
    const settledWrites = [/\/api\/references\/\$\{id\}`, \{ method: 'PATCH'/, /\/merge`/, /\/api\/manipulations/, /\/settle`/, /\/reopen`/, /\/withdraw`/, /\/submit`/, /\/screening`/];
    const writers = files(join(root, 'src/features'), /\.ts$/)
      .filter((p) => p.includes('/api/'))
      .map((p) => ({ p: relative(root, p), s: readFileSync(p, 'utf8') }))
      .filter(({ s }) => s.includes('useMutation') && settledWrites.some((re) => re.test(s)));
    expect(writers.length).toBeGreaterThanOrEqual(9);
    // a write may call registryChanged itself or a helper of its own that does (named by what it exports)
    const helpers = files(join(root, 'src'), /\.ts$/)
      .map((p) => readFileSync(p, 'utf8'))
      .filter((s) => /registryChanged\(/.test(s) && !s.includes('useMutation'))
      .flatMap((s) => [...s.matchAll(/export (?:const|function) (\w+)/g)].map((m) => m[1]));
    const reaches = new RegExp(`\\b(${['registryChanged', ...helpers].join('|')})\\(`);
    const offenders = writers.filter(({ s }) => !reaches.test(s)).map(({ p }) => p);
    expect(offenders).toEqual([]);
  });
});
