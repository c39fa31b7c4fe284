import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import type { Deps } from './deps.js';
import type { JobQueue } from '../adapters/jobs.js';
import { requestFilters, synthesize } from './synthesis.js';
import { settledEffectsFor } from './settled-effects-cache.js';
import { queueMails } from './mail.js';
import { NotFoundError } from '../lib/errors.js';
import { contactsOf } from '../repositories/users.js';
import { currentRegistryVersion } from '../repositories/registry-version.js';
import { deleteFollowByToken, deleteFollowOf, findFollow, listFollowsOf, followsBehind, insertFollow, insertFollowEvent, listFollowEvents, markFollowChecked, type FollowRow } from '../repositories/follows.js';
import { atomFeed, compareFollowed, describeEvent, type FollowedResult } from '../../shared/following/compare.js';
import { followedRequestSummary } from '../../shared/following/summary.js';
import type { Follow, FollowCreate, FollowList, UnsubscribeAnswer } from '../../shared/schemas/following.js';
import type { SynthesisRequest } from '../../shared/schemas/synthesis.js';

type Stored = FollowedResult & { fingerprint: string };

/** The followed result now, or null when no effect matches (nothing to pool). */
async function currentResult(db: Knex, request: SynthesisRequest): Promise<{ version: number; result: Stored | null }> {
  const { registryVersion, effects } = await settledEffectsFor(db, requestFilters(request));
  const fingerprint = createHash('sha1').update(JSON.stringify(effects)).digest('hex');
  if (effects.length === 0) return { version: registryVersion, result: null };
  const out = synthesize(effects, request);
  const r = out.result;
  const weights = Object.fromEntries(out.rows.map((row) => [`${row.referenceId}/${row.studyId}:${row.label}`, row.weight]));
  return { version: registryVersion, result: { k: r.k, estimate: r.estimate, se: r.se, ciLower: r.ci_lower, ciUpper: r.ci_upper, tau2: r.tau2, weights, fingerprint } };
}

const view = (f: FollowRow, origin: string): Follow => ({
  id: f.id,
  request: f.request,
  seShare: f.se_share,
  weightShare: f.weight_share,
  lastVersion: Number(f.last_version),
  createdAt: new Date(f.created_at).toISOString(),
  feedUrl: `${origin}/api/follows/${f.id}/feed.atom`,
});

export async function followSynthesis(db: Knex, userId: number, input: FollowCreate, origin: string): Promise<Follow> {
  const { version, result } = await currentResult(db, input.request);
  const row = await insertFollow(db, {
    user_id: userId,
    request: input.request,
    se_share: input.seShare,
    weight_share: input.weightShare,
    unsubscribe_token: randomBytes(24).toString('hex'),
    last_result: result,
    last_version: version,
  });
  return view(row, origin);
}

/** The caller's own follows, oldest first, each with its request in words. */
export async function listMyFollows(db: Knex, userId: number, origin: string): Promise<FollowList> {
  const rows = await listFollowsOf(db, userId);
  return { items: rows.map((f) => ({ ...view(f, origin), summary: followedRequestSummary(f.request) })) };
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
  const mails: Array<{ userId: number; follow: FollowRow; text: string }> = [];
  for (const f of follows) {
    const before = f.last_result as Stored | null;
    const { effects } = await settledEffectsFor(db, requestFilters(f.request as SynthesisRequest));
    const fingerprint = createHash('sha1').update(JSON.stringify(effects)).digest('hex');
    if (before && before.fingerprint === fingerprint) {
      await markFollowChecked(db, f.id, version);
      continue;
    }
    rerun += 1;
    const { result } = await currentResult(db, f.request as SynthesisRequest);
    const events = before && result ? compareFollowed(before, result, { seShare: f.se_share, weightShare: f.weight_share }) : [];
    if (events.length === 0) {
      // nothing crossed a threshold: keep the last notified result, remember the effects seen
      await markFollowChecked(db, f.id, version, before ? { ...before, fingerprint } : result);
      continue;
    }
    notified += 1;
    await db.transaction(async (trx) => {
      await insertFollowEvent(trx, { follow_id: f.id, registry_version: version, before, after: result, events });
      const mayMail = !f.last_mailed_at || now.getTime() - new Date(f.last_mailed_at).getTime() >= DAY_MS;
      await markFollowChecked(trx, f.id, version, result, mayMail ? now : undefined);
      if (mayMail) mails.push({ userId: f.user_id, follow: f, text: events.map(describeEvent).join('\n') });
    });
  }
  if (mails.length) {
    const contacts = await contactsOf(db, [...new Set(mails.map((m) => m.userId))]);
    await queueMails(
      deps,
      mails.flatMap((m) => {
        const to = contacts.get(m.userId)?.email;
        if (!to) return [];
        const body = `${m.text}\n\nFeed: ${deps.appOrigin}/api/follows/${m.follow.id}/feed.atom\nUnsubscribe: ${deps.appOrigin}/api/follows/unsubscribe?token=${m.follow.unsubscribe_token}\n`;
        return [{ kind: 'follow' as const, to, subject: 'A synthesis you follow has changed', body }];
      }),
    );
  }
  return { checked: follows.length, rerun, notified };
}

/** The follow's changes as Atom (RFC 4287), readable signed out. */
export async function followFeed(db: Knex, id: number, origin: string): Promise<string> {
  const f = await findFollow(db, id);
  if (!f) throw new NotFoundError('No such follow.');
  const events = await listFollowEvents(db, id);
  const updated = new Date(events[0]?.at ?? f.created_at).toISOString();
  return atomFeed({
    id: `${origin}/api/follows/${id}/feed.atom`,
    title: `Chronometa: changes to followed synthesis ${id}`,
    updated,
    link: `${origin}/api/follows/${id}/feed.atom`,
    entries: events.map((e) => ({
      id: `${origin}/api/follows/${id}/events/${e.id}`,
      title: `Registry version ${Number(e.registry_version)}`,
      updated: new Date(e.at).toISOString(),
      link: `${origin}/api/follows/${id}/feed.atom#${e.id}`,
      summary: (e.events as Parameters<typeof describeEvent>[0][]).map(describeEvent).join(' '),
    })),
  });
}

export const FOLLOW_QUEUE = 'follows.recheck';

/** The pg-boss job that re-checks follows, sent whenever the registry version passes the follows' own. */
export async function registerFollowWorkers(deps: Pick<Deps, 'db' | 'appOrigin'> & { jobs: JobQueue }): Promise<void> {
  await deps.jobs.work(FOLLOW_QUEUE, () => recheckFollows(deps).then(() => undefined));
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
