import type { PooledRow } from '../synthesis/types.js';
import type { PoolResult } from '../stats/types.js';

/** A followed synthesis's result, as last notified or as re-run now. */
export interface FollowedResult {
  k: number;
  estimate: number;
  se: number;
  ciLower: number;
  ciUpper: number;
  tau2: number | null;
  /** study label → percent weight */
  weights: Record<string, number>;
}

/** The compared numbers of a synthesis: its pooled result and each pooled unit's weight. */
export function followedResultOf(output: { result: PoolResult; rows: PooledRow[] }): FollowedResult {
  const r = output.result;
  const weights = Object.fromEntries(output.rows.map((row) => [`${row.referenceId}/${row.studyId}:${row.label}`, row.weight]));
  return { k: r.k, estimate: r.estimate, se: r.se, ciLower: r.ci_lower, ciUpper: r.ci_upper, tau2: r.tau2, weights };
}

export interface FollowThresholds {
  /** the estimate moved by more than this share of the last SE (default 0.5, common practice) */
  seShare: number;
  /** a newly added study carries more than this share of the weight (default 0.2, common practice) */
  weightShare: number;
}

export const DEFAULT_FOLLOW_THRESHOLDS: FollowThresholds = { seShare: 0.5, weightShare: 0.2 };

export type FollowEvent =
  | { kind: 'ci_excludes_zero' | 'ci_includes_zero' }
  | { kind: 'estimate_moved'; by: number; seShare: number }
  | { kind: 'heavy_new_study'; study: string; weight: number };

const excludesZero = (r: FollowedResult) => r.ciLower > 0 || r.ciUpper < 0;

/** The events that matter between the last notified result and now (none when nothing crossed a threshold). */
export function compareFollowed(before: FollowedResult, after: FollowedResult, t: FollowThresholds): FollowEvent[] {
  const out: FollowEvent[] = [];
  if (excludesZero(before) !== excludesZero(after)) out.push({ kind: excludesZero(after) ? 'ci_excludes_zero' : 'ci_includes_zero' });
  const by = after.estimate - before.estimate;
  if (before.se > 0 && Math.abs(by) > t.seShare * before.se) out.push({ kind: 'estimate_moved', by, seShare: Math.abs(by) / before.se });
  for (const [study, weight] of Object.entries(after.weights)) {
    if (!(study in before.weights) && weight / 100 > t.weightShare) out.push({ kind: 'heavy_new_study', study, weight });
  }
  return out;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

export interface AtomEntry {
  id: string;
  title: string;
  updated: string;
  summary: string;
  link: string;
}

/** An Atom (RFC 4287) feed: id, title, updated and author on the feed; id, title, updated on each entry. */
export function atomFeed(f: { id: string; title: string; updated: string; link: string; entries: AtomEntry[] }): string {
  const entries = f.entries
    .map(
      (e) =>
        `  <entry>\n    <id>${esc(e.id)}</id>\n    <title>${esc(e.title)}</title>\n    <updated>${esc(e.updated)}</updated>\n    <link href="${esc(e.link)}"/>\n    <summary>${esc(e.summary)}</summary>\n  </entry>\n`,
    )
    .join('');
  return `<?xml version="1.0" encoding="utf-8"?>\n<feed xmlns="http://www.w3.org/2005/Atom">\n  <id>${esc(f.id)}</id>\n  <title>${esc(f.title)}</title>\n  <updated>${esc(f.updated)}</updated>\n  <author><name>Chronometa</name></author>\n  <link rel="self" href="${esc(f.link)}"/>\n${entries}</feed>\n`;
}

export function describeEvent(e: FollowEvent): string {
  switch (e.kind) {
    case 'ci_excludes_zero':
      return 'The confidence interval now excludes 0.';
    case 'ci_includes_zero':
      return 'The confidence interval now includes 0.';
    case 'estimate_moved':
      return `The estimate moved by ${e.by.toFixed(3)} (${e.seShare.toFixed(2)} of its earlier SE).`;
    case 'heavy_new_study':
      return `A new study, ${e.study}, carries ${e.weight.toFixed(1)}% of the weight.`;
  }
}
