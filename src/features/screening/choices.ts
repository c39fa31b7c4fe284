import { EXCLUSION_REASON_LABELS, STAGE_REASONS, type ExclusionReason, type ScreeningStage } from '../../../shared/vocabulary/screening';

/** One line of the decision chooser: include, or exclude for one reason (at title and abstract, also without one). */
export type Choice = { decision: 'included' } | { decision: 'excluded'; reason?: ExclusionReason };

/** A stage's lines: include, its own reasons, and at title and abstract an exclusion without a reason. */
export const choicesFor = (stage: ScreeningStage): Choice[] => [
  { decision: 'included' },
  ...STAGE_REASONS[stage].map((reason) => ({ decision: 'excluded' as const, reason })),
  ...(stage === 'title_abstract' ? [{ decision: 'excluded' as const }] : []),
];

export const choiceLabel = (c: Choice) => (c.decision === 'included' ? 'Include' : c.reason ? EXCLUSION_REASON_LABELS[c.reason] : 'Without a reason');
export const choiceKey = (c: Choice) => (c.decision === 'included' ? 'include' : (c.reason ?? 'no-reason'));

const words = (s: string) => s.toLowerCase().match(/[a-z0-9]+/g) ?? [];

/**
 * Whether typed letters pick out a label: the start of the label ("no us"), the start of each of its words in
 * order ("us st" → "no usable statistics"), or its initials ("nus").
 */
export function matchesTyped(label: string, typed: string): boolean {
  const t = typed.trim().toLowerCase();
  if (!t || label.toLowerCase().startsWith(t)) return true;
  const w = words(label);
  let at = 0;
  const inOrder = words(t).every((p) => {
    while (at < w.length && !w[at].startsWith(p)) at++;
    return at++ < w.length;
  });
  return inOrder || (!/\s/.test(t) && w.map((x) => x[0]).join('').startsWith(t));
}

/** The chooser's lines of a stage for what was typed; an exclusion typed as "ex…" keeps every reason. */
export function filterChoices(typed: string, stage: ScreeningStage = 'title_abstract'): Choice[] {
  const t = typed.trim().toLowerCase();
  const all = choicesFor(stage);
  if (t.length >= 2 && 'exclude'.startsWith(t)) return all.filter((c) => c.decision === 'excluded');
  return all.filter((c) => matchesTyped(choiceLabel(c), t));
}

/** Text cut into plain parts and parts that name one of `terms` (whole words, a plural allowed, any case). */
export function highlightParts(text: string, terms: string[]): { text: string; term: boolean }[] {
  const clean = [...new Set(terms.map((t) => t.trim()).filter((t) => t.length >= 3))].sort((a, b) => b.length - a.length);
  if (!clean.length || !text) return text ? [{ text, term: false }] : [];
  const escaped = clean.map((t) => t.replace(/[.*+?^${}()|[\]\\]/g, '\\$&').replace(/[\s_-]+/g, '[\\s_-]+'));
  const re = new RegExp(`\\b(?:${escaped.join('|')})(?:s|es)?\\b`, 'gi');
  const parts: { text: string; term: boolean }[] = [];
  let last = 0;
  for (const m of text.matchAll(re)) {
    if (m.index > last) parts.push({ text: text.slice(last, m.index), term: false });
    parts.push({ text: m[0], term: true });
    last = m.index + m[0].length;
  }
  if (last < text.length) parts.push({ text: text.slice(last), term: false });
  return parts;
}
