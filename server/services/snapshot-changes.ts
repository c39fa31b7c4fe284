import type { Knex } from 'knex';
import { NotFoundError } from '../lib/errors.js';
import { requestFilters, synthesize } from './synthesis.js';
import { settledEffectsFor } from './settled-effects-cache.js';
import { loadSnapshot } from './snapshots.js';
import { comparedResult, effectsFingerprint } from './followed-results.js';
import { currentRegistryVersion } from '../repositories/registry-version.js';
import { findSnapshotHead, insertSnapshotChange, listSnapshotChanges, markSnapshotChecked, snapshotEffectsAndRows, snapshotsBehind } from '../repositories/snapshots.js';
import { atomFeed, compareFollowed, DEFAULT_FOLLOW_THRESHOLDS, describeEvent, followedResultOf, type FollowEvent, type FollowedResult } from '../../shared/following/compare.js';
import { changeCounts, diffEffects } from '../../shared/following/changes.js';
import type { SnapshotDiff } from '../../shared/schemas/following.js';
import type { SynthesisRequest } from '../../shared/schemas/synthesis.js';
import type { PoolResult } from '../../shared/stats/types.js';
import type { PooledRow, SettledEffect } from '../../shared/synthesis/types.js';

/** How today's registry differs from a snapshot: k and estimate then and now, and the effects that changed. */
export async function snapshotDiff(db: Knex, id: string): Promise<SnapshotDiff> {
  const s = await loadSnapshot(db, id);
  const { registryVersion, effects } = await settledEffectsFor(db, requestFilters(s.request));
  const now = effects.length ? synthesize(effects, s.request) : null;
  return {
    snapshotId: s.id,
    request: s.request,
    then: comparedResult(s.output, s.registryVersion),
    now: comparedResult(now, registryVersion),
    registryVersion,
    effectsRecorded: true,
    ...diffEffects(s.effects, effects),
  };
}

interface ChangeResult {
  k: number;
  estimate: number;
  ciLower: number;
  ciUpper: number;
}
interface ChangeIds {
  added: number[];
  withdrawn: number[];
  corrected: number[];
}

/**
 * Checks every snapshot not yet checked at this registry version: one whose matching effects are as last seen is
 * only moved forward; for the others a feed entry records today's result and what changed since the snapshot.
 */
export async function recheckSnapshots(db: Knex): Promise<{ checked: number; changed: number }> {
  const version = await currentRegistryVersion(db);
  const heads = await snapshotsBehind(db, version);
  let changed = 0;
  for (const h of heads) {
    const request = h.request as SynthesisRequest;
    let effects: SettledEffect[];
    try {
      effects = (await settledEffectsFor(db, requestFilters(request))).effects;
    } catch {
      continue; // a request this version no longer reads stays unchecked
    }
    const fingerprint = effectsFingerprint(effects);
    // the snapshot's own rows are read only when needed: never checked yet, or changed
    const frozen = h.fingerprint === fingerprint ? null : await snapshotEffectsAndRows(db, h.id);
    if (!frozen || fingerprint === (h.fingerprint ?? effectsFingerprint(frozen.effects as SettledEffect[]))) {
      await markSnapshotChecked(db, h.id, fingerprint, version);
      continue;
    }
    const frozenEffects = frozen.effects as SettledEffect[];
    let now: FollowedResult | null = null;
    try {
      now = effects.length ? followedResultOf(synthesize(effects, request)) : null;
    } catch {
      now = null;
    }
    const then = followedResultOf({ result: h.result as PoolResult, rows: frozen.rows as PooledRow[] });
    const diff = diffEffects(frozenEffects, effects);
    const ids: ChangeIds = { added: diff.added.map((e) => e.id), withdrawn: diff.withdrawn.map((e) => e.id), corrected: diff.corrected.map((c) => c.after.id) };
    const events = now ? compareFollowed(then, now, DEFAULT_FOLLOW_THRESHOLDS) : [];
    const result: ChangeResult | null = now && { k: now.k, estimate: now.estimate, ciLower: now.ciLower, ciUpper: now.ciUpper };
    await db.transaction(async (trx) => {
      await insertSnapshotChange(trx, { snapshot_id: h.id, registry_version: version, result, changes: ids, events });
      await markSnapshotChecked(trx, h.id, fingerprint, version);
    });
    changed += 1;
  }
  return { checked: heads.length, changed };
}

const num = (x: number) => x.toFixed(3);

/** A snapshot's changes as Atom (RFC 4287): each entry is today's registry against the snapshot, readable signed out. */
export async function snapshotFeed(db: Knex, id: string, origin: string): Promise<string> {
  const h = await findSnapshotHead(db, id);
  if (!h) throw new NotFoundError(`No snapshot ${id}.`);
  const then = h.result as PoolResult;
  const rows = await listSnapshotChanges(db, id);
  const feedUrl = `${origin}/api/snapshots/${id}/feed.atom`;
  return atomFeed({
    id: feedUrl,
    title: `Chronometa: how the registry moved from snapshot “${h.title}”`,
    updated: new Date(rows[0]?.at ?? h.created_at).toISOString(),
    link: feedUrl,
    entries: rows.map((r) => {
      const now = r.result as ChangeResult | null;
      const words = now
        ? `Today k = ${now.k}, estimate ${num(now.estimate)} [${num(now.ciLower)}, ${num(now.ciUpper)}]; in the snapshot (registry version ${Number(h.registry_version)}) k = ${then.k}, estimate ${num(then.estimate)} [${num(then.ci_lower)}, ${num(then.ci_upper)}].`
        : `No settled effect matches the snapshot's request any more (the snapshot had k = ${then.k}).`;
      const events = (r.events as FollowEvent[]).map(describeEvent).join(' ');
      return {
        id: `${origin}/api/snapshots/${id}/changes/${r.id}`,
        title: `Registry version ${Number(r.registry_version)}: ${changeCounts(r.changes as ChangeIds)} since the snapshot`,
        updated: new Date(r.at).toISOString(),
        link: `${origin}/snapshots/${id}#registry-today`,
        summary: events ? `${words} ${events}` : words,
      };
    }),
  });
}

