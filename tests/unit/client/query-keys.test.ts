import { QueryClient } from '@tanstack/react-query';
import { describe, expect, it } from 'vitest';
import { queryKeys } from '../../../src/lib/query/keys';
import { SETTLED_DATA_KEYS, registryChanged } from '../../../src/lib/query/registry-changed';

const startsWith = (key: readonly unknown[], prefix: readonly unknown[]) => prefix.every((part, i) => key[i] === part);

describe('the query-key registry', () => {
  it('gives every domain its own first key segment', () => {
    const roots = Object.values(queryKeys).map((d) => d.all[0]);
    expect(new Set(roots).size).toBe(roots.length);
  });

  it('nests all → lists → list(filters) and all → details → detail(id) in every domain', () => {
    for (const [name, d] of Object.entries(queryKeys)) {
      expect(startsWith(d.lists(), d.all), name).toBe(true);
      expect(startsWith(d.list({ page: 2 }), d.lists()), name).toBe(true);
      expect(d.list({ page: 2 }).at(-1), name).toEqual({ page: 2 });
      expect(startsWith(d.details(), d.all), name).toBe(true);
      expect(startsWith(d.detail(7), d.details()), name).toBe(true);
      expect(d.detail(7).at(-1), name).toBe(7);
    }
  });

  it('puts an import batch’s entry pages under the batch, so invalidating the batch reaches them', () => {
    expect(startsWith(queryKeys.imports.entries(3, { page: 2 }), queryKeys.imports.detail(3))).toBe(true);
  });
});

describe('registryChanged', () => {
  /** One cached query per key, all fresh, so only an invalidation can make one stale. */
  function cacheWith(keys: ReadonlyArray<readonly unknown[]>) {
    const qc = new QueryClient({ defaultOptions: { queries: { staleTime: Infinity } } });
    for (const key of keys) qc.setQueryData(key, { cached: true });
    return qc;
  }
  const touched = [
    queryKeys.synthesis.run({ filters: {} }),
    queryKeys.synthesis.facets(),
    queryKeys.atlas.landing(),
    queryKeys.atlas.manipulation('luminance'),
    queryKeys.atlas.references('outcomes', 'temporal_order', { page: 1 }),
    queryKeys.effects.list({ page: 1 }),
    queryKeys.snapshots.diff('abcdefghij'),
    queryKeys.follows.changes(1, undefined),
    queryKeys.search.list({ q: 'looming' }),
    queryKeys.manipulations.list({ includeRetired: true }),
  ];
  const untouched = [
    // a snapshot is frozen: only its comparison with today's registry moves
    queryKeys.snapshots.detail('abcdefghij'),
    queryKeys.snapshots.list({ page: 1 }),
    queryKeys.follows.lists(),
    queryKeys.references.detail(1),
    queryKeys.tokens.lists(),
    queryKeys.users.list({ page: 1 }),
    queryKeys.auth.me(),
    queryKeys.audit.list({ page: 1 }),
  ];

  it('invalidates synthesis, atlas, effects, snapshot and follow comparisons, search and the vocabulary counts together', async () => {
    const qc = cacheWith([...touched, ...untouched]);
    await registryChanged(qc);
    for (const key of touched) expect(qc.getQueryState(key)?.isInvalidated, JSON.stringify(key)).toBe(true);
  });

  it('leaves everything else as it was', async () => {
    const qc = cacheWith([...touched, ...untouched]);
    await registryChanged(qc);
    for (const key of untouched) expect(qc.getQueryState(key)?.isInvalidated, JSON.stringify(key)).toBe(false);
  });

  it('names each of those domains once', () => {
    expect(SETTLED_DATA_KEYS.map((k) => k[0])).toEqual(['syntheses', 'atlas', 'effects', 'snapshots', 'follows', 'search', 'manipulations']);
  });
});
