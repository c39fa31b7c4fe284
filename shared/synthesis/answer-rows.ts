import { SYNTHESIS_INLINE_ROWS, SYNTHESIS_ROWS_PAGE, type SynthesisRowSort } from '../schemas/synthesis.js';
import type { PooledRow, SynthesisOutput } from './types.js';

/** The answer of a synthesis: every row up to SYNTHESIS_INLINE_ROWS, else the first page of rows and weights and `rowsTotal`. */
export function answerRows<T extends SynthesisOutput>(output: T): T {
  if (output.rows.length <= SYNTHESIS_INLINE_ROWS) return output;
  return {
    ...output,
    rows: output.rows.slice(0, SYNTHESIS_ROWS_PAGE),
    result: { ...output.result, weights: output.result.weights.slice(0, SYNTHESIS_ROWS_PAGE) },
    rowsTotal: output.rows.length,
  };
}

const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
/** Every field rows are sorted on (`se` and `variance` order alike). */
const SORT_VALUE: Record<Exclude<SynthesisRowSort, 'position'>, (r: PooledRow) => string | number | null | undefined> = {
  label: (r) => r.label,
  year: (r) => r.year,
  n: (r) => r.n,
  effect: (r) => r.effect,
  se: (r) => r.variance,
  variance: (r) => r.variance,
  weight: (r) => r.weight,
  effects: (r) => r.effectIds.length,
  subgroup: (r) => r.subgroup,
  moderator: (r) => r.moderator,
};

/** The row indices sorted on the field (strings in code-point order, missing values last either way, ties in row order). */
export function rowOrder(rows: readonly PooledRow[], sort: SynthesisRowSort, order: 'asc' | 'desc'): number[] {
  const dir = order === 'asc' ? 1 : -1;
  const value = sort === 'position' ? null : SORT_VALUE[sort];
  const keys = rows.map((r, i) => (value ? value(r) : i));
  return rows
    .map((_, i) => i)
    .sort((a, b) => {
      const x = keys[a];
      const y = keys[b];
      if (x == null || y == null) return x == null && y == null ? a - b : x == null ? 1 : -1;
      const c = typeof x === 'number' && typeof y === 'number' ? x - y : cmp(String(x), String(y));
      return c * dir || a - b;
    });
}

