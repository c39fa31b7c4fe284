import { describe, expect, it } from 'vitest';
import { SYNTHESIS_INLINE_ROWS, SYNTHESIS_ROWS_PAGE } from '../../../shared/schemas/synthesis.js';
import { answerRows, rowsPage } from '../../../shared/synthesis/answer-rows.js';
import type { PooledRow, SynthesisOutput } from '../../../shared/synthesis/types.js';

const row = (i: number): PooledRow => ({ studyId: i, referenceId: i, label: `Paper ${i % 7}`, effect: Math.sin(i), variance: 0.1, year: i % 5 ? 2000 + (i % 5) : null, n: 20, effectIds: [i], weight: 1 });
const output = (k: number) => ({ rows: Array.from({ length: k }, (_, i) => row(i)), result: { weights: Array.from({ length: k }, (_, i) => i) } }) as unknown as SynthesisOutput;

describe('a synthesis answer with many rows', () => {
  it(`keeps every row up to ${SYNTHESIS_INLINE_ROWS}; beyond, the first page of rows and weights and rowsTotal`, () => {
    const small = output(SYNTHESIS_INLINE_ROWS);
    expect(answerRows(small)).toBe(small);
    const big = output(SYNTHESIS_INLINE_ROWS + 1);
    const cut = answerRows(big);
    expect(cut.rows).toEqual(big.rows.slice(0, SYNTHESIS_ROWS_PAGE));
    expect(cut.result.weights).toEqual(big.result.weights.slice(0, SYNTHESIS_ROWS_PAGE));
    expect(cut.rowsTotal).toBe(SYNTHESIS_INLINE_ROWS + 1);
    expect(big.rows).toHaveLength(SYNTHESIS_INLINE_ROWS + 1);
  });

  it('rowsPage sorts the whole list before paging; missing values come last in either order', () => {
    const rows = output(40).rows;
    const asc = rowsPage(rows, { page: 1, pageSize: 40, sort: 'year', order: 'asc' }).items;
    const desc = rowsPage(rows, { page: 1, pageSize: 40, sort: 'year', order: 'desc' }).items;
    for (const list of [asc, desc]) expect(list.slice(-8).every((r) => r.year === null)).toBe(true);
    expect(asc[0].year).toBe(2001);
    expect(desc[0].year).toBe(2004);
    const page2 = rowsPage(rows, { page: 2, pageSize: 10, sort: 'effect', order: 'desc' });
    const effects = [...rows].sort((a, b) => b.effect - a.effect).slice(10, 20);
    expect(page2).toEqual({ items: effects, total: 40, page: 2, pageSize: 10 });
    expect(rowsPage(rows, { page: 5, pageSize: 10, sort: 'position', order: 'asc' }).items).toEqual([]);
  });
});
