import { describe, expect, it } from 'vitest';
import { SYNTHESIS_INLINE_ROWS, SYNTHESIS_ROWS_PAGE } from '../../../shared/schemas/synthesis.js';
import { answerRows, rowOrder } from '../../../shared/synthesis/answer-rows.js';
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

  it('rowOrder sorts the whole list (the page is a slice of it); missing values come last in either order, ties in row order', () => {
    const rows = output(40).rows;
    const sorted = (sort: Parameters<typeof rowOrder>[1], order: 'asc' | 'desc') => rowOrder(rows, sort, order).map((i) => rows[i]);
    const asc = sorted('year', 'asc');
    const desc = sorted('year', 'desc');
    for (const list of [asc, desc]) expect(list.slice(-8).every((r) => r.year === null)).toBe(true);
    expect(asc[0].year).toBe(2001);
    expect(desc[0].year).toBe(2004);
    // ties (eight rows a year) keep the rows' own order, in either direction
    expect(asc.slice(0, 8).map((r) => r.studyId)).toEqual(rows.filter((r) => r.year === 2001).map((r) => r.studyId));
    expect(desc.slice(0, 8).map((r) => r.studyId)).toEqual(rows.filter((r) => r.year === 2004).map((r) => r.studyId));
    expect(asc.slice(-8).map((r) => r.studyId)).toEqual(rows.filter((r) => r.year === null).map((r) => r.studyId));
    const page2 = sorted('effect', 'desc').slice(10, 20);
    expect(page2).toEqual([...rows].sort((a, b) => b.effect - a.effect).slice(10, 20));
    expect(rowOrder(rows, 'position', 'asc')).toEqual(rows.map((_, i) => i));
    expect(sorted('se', 'asc')).toEqual(sorted('variance', 'asc'));
  });
});
