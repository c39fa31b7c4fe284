import { synthesisRequestSchema } from '../schemas/synthesis.js';
import { labelOf } from '../vocabulary/labels.js';
import { modelLabel } from '../synthesis/methods.js';

/** A followed request in words: its filters by their labels, then its model ("all settled effects" when unfiltered). */
export function followedRequestSummary(request: unknown): string {
  const parsed = synthesisRequestSchema.safeParse(request);
  if (!parsed.success) return 'a synthesis request this version no longer reads';
  const q = parsed.data;
  const f = q.filters;
  const parts: string[] = [];
  if (f.manipulation !== undefined) parts.push(`${labelOf('filter', 'manipulation')}: ${([] as string[]).concat(f.manipulation).map((m) => labelOf('manipulation', m)).join(', ')}`);
  for (const kind of ['outcome', 'parameter', 'unit', 'metric', 'population', 'modality', 'task', 'design'] as const) {
    const v = f[kind];
    if (v !== undefined) parts.push(`${labelOf('filter', kind)}: ${labelOf(kind, v)}`);
  }
  if (f.yearFrom !== undefined || f.yearTo !== undefined) parts.push(`years ${f.yearFrom ?? '…'}–${f.yearTo ?? '…'}`);
  return `${parts.length ? parts.join('; ') : 'all settled effects'} — ${modelLabel(q)}`;
}
