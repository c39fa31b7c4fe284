import { randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import type { Deps } from './deps.js';
import type { JobQueue } from '../adapters/jobs.js';
import { requestFilters, synthesize } from './synthesis.js';
import { settledEffectsFor } from './settled-effects-cache.js';
import { queueMails } from './mail.js';
import { loadSnapshot } from './snapshots.js';
import { recheckSnapshots } from './snapshot-changes.js';
import { comparedResult, effectsFingerprint, synthesisEffect, type Stored } from './followed-results.js';
import { NotFoundError } from '../lib/errors.js';
import { contactsOf } from '../repositories/users.js';
import { currentRegistryVersion } from '../repositories/registry-version.js';
import { deleteFollowByToken, deleteFollowOf, findFollow, findFollowOf, listFollowsOf, followsBehind, insertFollow, insertFollowEvent, listFollowEvents, markFollowChecked, type FollowRow } from '../repositories/follows.js';
import { atomFeed, compareFollowed, describeEvent, followedResultOf, type FollowEvent } from '../../shared/following/compare.js';
import { diffEffects } from '../../shared/following/changes.js';
import { followedRequestSummary } from '../../shared/following/summary.js';
import type { ComparedResult, Follow, FollowChanges, FollowCreate, FollowList, FollowListItem, UnsubscribeAnswer } from '../../shared/schemas/following.js';
import type { SynthesisRequest } from '../../shared/schemas/synthesis.js';
import type { SettledEffect, SynthesisOutput } from '../../shared/synthesis/types.js';

/** The followed result now, or null when no effect matches (nothing to pool). */
async function currentResult(db: Knex, request: SynthesisRequest): Promise<{ version: number; effects: SettledEffect[]; output: SynthesisOutput | null; result: Stored | null }> {
  const { registryVersion, effects } = await settledEffectsFor(db, requestFilters(request));
  const fingerprint = effectsFingerprint(effects);
  if (effects.length === 0) return { version: registryVersion, effects, output: null, result: null };
  const output = synthesize(effects, request);
  return { version: registryVersion, effects, output, result: { ...followedResultOf(output), fingerprint, effects: effects.map(synthesisEffect), registryVersion } };
}

const view = (f: FollowRow, origin: string): Follow => ({
  id: f.id,
  request: f.request,
  snapshotId: f.snapshot_id,
  seShare: f.se_share,
  weightShare: f.weight_share,
  lastVersion: Number(f.last_version),
  createdAt: new Date(f.created_at).toISOString(),
  feedUrl: `${origin}/api/follows/${f.id}/feed.atom`,
  changesUrl: `${origin}/follows/${f.id}/changes`,
});

const listItem = (f: FollowRow, origin: string): FollowListItem => ({ ...view(f, origin), summary: followedRequestSummary(f.request) });

/**
 * Follows a synthesis request, starting from its result now; or a snapshot, starting from the snapshot's own
 * result, so the first re-check that sees its effects change compares today's registry with the snapshot.
 */
export async function followSynthesis(db: Knex, userId: number, input: FollowCreate, origin: string): Promise<Follow> {
  let request: SynthesisRequest;
  let start: Stored | null;
  let version: number;
  if (input.snapshotId !== undefined) {
    const s = await loadSnapshot(db, input.snapshotId);
    request = s.request;
    const now = await settledEffectsFor(db, requestFilters(request));
    version = now.registryVersion;
    start = { ...followedResultOf(s.output), fingerprint: effectsFingerprint(now.effects), effects: s.effects.map(synthesisEffect), registryVersion: s.registryVersion };
  } else {
    request = input.request!;
    ({ version, result: start } = await currentResult(db, request));
  }
  const row = await insertFollow(db, {
    user_id: userId,
    request,
    snapshot_id: input.snapshotId ?? null,
    se_share: input.seShare,
    weight_share: input.weightShare,
    unsubscribe_token: randomBytes(24).toString('hex'),
    last_result: start,
    last_version: version,
  });
  return view(row, origin);
}

/** The caller's own follows, oldest first, each with its request in words. */
export async function listMyFollows(db: Knex, userId: number, origin: string): Promise<FollowList> {
  const rows = await listFollowsOf(db, userId);
  return { items: rows.map((f) => listItem(f, origin)) };
}

/** Signed in, without the mail's link: only the follower may stop; anyone else is told there is no such follow. */
export async function stopFollowing(db: Knex, userId: number, id: number): Promise<void> {
  if ((await deleteFollowOf(db, userId, id)) === 0) throw new NotFoundError(`You follow nothing with id ${id}.`);
}

/** Signed out, from the mail's link: the token alone says which follow. */
export async function unsubscribe(db: Knex, token: string): Promise<UnsubscribeAnswer> {
  return { unsubscribed: (await deleteFollowByToken(db, token)) > 0 };
}

const DAY_MS = 24 * 60 * 60 * 1000;

/**
 * Re-checks every follow behind the registry version. A follow whose matching effects are unchanged (same
 * fingerprint) is only moved forward; the others are re-run and compared with the last notified result.
 * Returns how many were re-run and how many crossed a threshold.
 */
export async function recheckFollows(deps: Pick<Deps, 'db' | 'jobs' | 'appOrigin'>, now = new Date()): Promise<{ checked: number; rerun: number; notified: number }> {
  const { db } = deps;
  const version = await currentRegistryVersion(db);
  const follows = await followsBehind(db, version);
  let rerun = 0;
  let notified = 0;
  const mails: Array<{ userId: number; follow: FollowRow; eventId: number; text: string }> = [];
  for (const f of follows) {
    const before = f.last_result as Stored | null;
    let current: Awaited<ReturnType<typeof currentResult>>;
    try {
      const { effects } = await settledEffectsFor(db, requestFilters(f.request as SynthesisRequest));
      if (before && before.fingerprint === effectsFingerprint(effects)) {
        await markFollowChecked(db, f.id, version);
        continue;
      }
      current = await currentResult(db, f.request as SynthesisRequest);
    } catch {
      // a request this version cannot pool (e.g. mixed metrics after an edit): move on, nothing to tell
      await markFollowChecked(db, f.id, version);
      continue;
    }
    rerun += 1;
    const { result } = current;
    const events = before && result ? compareFollowed(before, result, { seShare: f.se_share, weightShare: f.weight_share }) : [];
    if (events.length === 0) {
      // nothing crossed a threshold: keep the last notified result, remember the effects seen
      await markFollowChecked(db, f.id, version, before ? { ...before, fingerprint: effectsFingerprint(current.effects) } : result);
      continue;
    }
    notified += 1;
    await db.transaction(async (trx) => {
      const eventId = await insertFollowEvent(trx, { follow_id: f.id, registry_version: version, before, after: result, events });
      const mayMail = !f.last_mailed_at || now.getTime() - new Date(f.last_mailed_at).getTime() >= DAY_MS;
      await markFollowChecked(trx, f.id, version, result, mayMail ? now : undefined);
      if (mayMail) mails.push({ userId: f.user_id, follow: f, eventId, text: events.map(describeEvent).join('\n') });
    });
  }
  if (mails.length) {
    const contacts = await contactsOf(db, [...new Set(mails.map((m) => m.userId))]);
    await queueMails(
      deps,
      mails.flatMap((m) => {
        const to = contacts.get(m.userId)?.email;
        if (!to) return [];
        const o = deps.appOrigin;
        const body = `${m.text}\n\nWhat changed: ${o}/follows/${m.follow.id}/changes?since=${m.eventId}\nFeed: ${o}/api/follows/${m.follow.id}/feed.atom\nUnsubscribe: ${o}/api/follows/unsubscribe?token=${m.follow.unsubscribe_token}\n`;
        return [{ kind: 'follow' as const, to, subject: 'A synthesis you follow has changed', body }];
      }),
    );
  }
  return { checked: follows.length, rerun, notified };
}

/** The follows re-check and the snapshots' feeds, one job per registry version. */
export async function recheckAll(deps: Pick<Deps, 'db' | 'jobs' | 'appOrigin'>): Promise<void> {
  await recheckFollows(deps);
  await recheckSnapshots(deps.db);
}

/**
 * The follower's "what changed since": the result before a feed entry (the newest by default; with no entry yet,
 * the result the follow began from) against today's registry, with the effects added, withdrawn and corrected.
 */
export async function followChanges(db: Knex, userId: number, id: number, since: number | undefined, origin: string): Promise<FollowChanges> {
  const f = await findFollowOf(db, userId, id);
  if (!f) throw new NotFoundError(`You follow nothing with id ${id}.`);
  const events = await listFollowEvents(db, id);
  const from = since === undefined ? events[0] : events.find((e) => e.id === since);
  if (since !== undefined && !from) throw new NotFoundError(`Feed entry ${since} is not one of follow ${id}'s.`);
  const then = (from ? from.before : f.last_result) as Stored | null;
  const request = f.request as SynthesisRequest;
  const current = await currentResult(db, request);
  const thenEffects = then?.effects ?? (then ? null : []);
  let thenOutput: SynthesisOutput | null = null;
  if (thenEffects?.length) {
    try {
      thenOutput = synthesize(thenEffects, request);
    } catch {
      thenOutput = null;
    }
  }
  const thenSide: ComparedResult = then
    ? { registryVersion: then.registryVersion ?? null, k: then.k, estimate: then.estimate, ciLower: then.ciLower, ciUpper: then.ciUpper, tau2: then.tau2, forest: thenOutput?.figures.forest ?? null }
    : null;
  const diff = thenEffects ? diffEffects(thenEffects, current.effects) : { added: [], withdrawn: [], corrected: [] };
  return {
    follow: listItem(f, origin),
    since: { eventId: from?.id ?? null, at: new Date(from?.at ?? f.created_at).toISOString() },
    events: events.map((e) => ({ id: e.id, at: new Date(e.at).toISOString(), registryVersion: Number(e.registry_version), text: (e.events as FollowEvent[]).map(describeEvent).join(' ') })),
    then: thenSide,
    now: comparedResult(current.output, current.version),
    registryVersion: current.version,
    effectsRecorded: thenEffects !== null,
    ...diff,
  };
}

/** The follow's changes as Atom (RFC 4287), readable signed out. */
export async function followFeed(db: Knex, id: number, origin: string): Promise<string> {
  const f = await findFollow(db, id);
  if (!f) throw new NotFoundError('No such follow.');
  const events = await listFollowEvents(db, id);
  const updated = new Date(events[0]?.at ?? f.created_at).toISOString();
  return atomFeed({
    id: `${origin}/api/follows/${id}/feed.atom`,
    title: `Chronometa: changes to followed ${f.snapshot_id ? `snapshot ${f.snapshot_id}` : `synthesis ${id}`}`,
    updated,
    link: `${origin}/api/follows/${id}/feed.atom`,
    entries: events.map((e) => ({
      id: `${origin}/api/follows/${id}/events/${e.id}`,
      title: `Registry version ${Number(e.registry_version)}`,
      updated: new Date(e.at).toISOString(),
      link: `${origin}/follows/${id}/changes?since=${e.id}`,
      summary: (e.events as FollowEvent[]).map(describeEvent).join(' '),
    })),
  });
}

export const FOLLOW_QUEUE = 'follows.recheck';

/** The pg-boss job that re-checks follows, sent whenever the registry version passes the follows' own. */
export async function registerFollowWorkers(deps: Pick<Deps, 'db' | 'appOrigin'> & { jobs: JobQueue }): Promise<void> {
  await deps.jobs.work(FOLLOW_QUEUE, () => recheckAll(deps));
  let seen = -1;
  const timer = setInterval(() => {
    void currentRegistryVersion(deps.db)
      .then(async (v) => {
        if (v !== seen) {
          seen = v;
          await deps.jobs.send(FOLLOW_QUEUE, { version: v }, { singletonKey: `follows-${v}` });
        }
      })
      .catch(() => undefined);
  }, 15_000);
  timer.unref();
}
