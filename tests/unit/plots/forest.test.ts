import { describe, expect, it } from 'vitest';
import { FOREST_TOP_AXIS_ROWS, forestFigure, wrapLabel, type ForestInput } from '../../../shared/plots/forest.js';
import type { PlotFigure } from '../../../shared/synthesis/types.js';
import { mulberry32 } from '../../support/random.js';

type Trace = Record<string, unknown>;
const trace = (fig: PlotFigure, name: string) => fig.data.find((t) => t.name === name) as Trace | undefined;
const byMeta = (fig: PlotFigure, meta: string) => fig.data.filter((t) => t.meta === meta);
const lines = (html: string) => html.split('<br>').map((l) => l.replace(/<\/?b>/g, ''));

type Band = { column: string; what: string; lo: number; hi: number };
/** Every drawn piece of text, as the y band it takes (one line of text = 1 unit of y) in its column (axis and x). */
function bands(fig: PlotFigure): Band[] {
  const out: Band[] = [];
  for (const t of fig.data) {
    if (t.mode === 'text') {
      (t.y as number[]).forEach((y, i) => {
        const n = lines((t.text as string[])[i]).length;
        out.push({ column: `${String(t.xaxis)}:${(t.x as number[])[i]}`, what: `${String(t.name ?? 'header')}: ${(t.text as string[])[i]}`, lo: y - n / 2, hi: y + n / 2 });
      });
    }
  }
  return out;
}

function study(i: number, rand: () => number, label = `Invented lab ${i} and colleagues`) {
  return { label, year: 2000 + (i % 20), n: 12 + (i % 30), effect: 0.3 + (rand() - 0.5), variance: 0.02 + rand() * 0.05, weight: 100 / 60, group: i % 2 ? 'a' : 'b' };
}

function input(k: number, extra: Partial<ForestInput> = {}): ForestInput {
  const rand = mulberry32(13);
  return {
    metric: 'smd_raw_score',
    metricLabel: "Hedges' g",
    level: 0.95,
    studies: Array.from({ length: k }, (_, i) => study(i, rand)),
    pooled: { label: 'Random-effects estimate (DL)', estimate: 0.3, ci_lower: 0.2, ci_upper: 0.4, pi_lower: 0.0, pi_upper: 0.6 },
    ...extra,
  };
}

describe('wrapLabel', () => {
  it('breaks at spaces, splits a word longer than a line, and ends a cut label with …', () => {
    expect(wrapLabel('Dimmer flashes feel shorter', 12, 3)).toEqual(['Dimmer', 'flashes feel', 'shorter']);
    expect(wrapLabel('abcdefghijklmnop', 6, 4)).toEqual(['abcdef', 'ghijkl', 'mnop']);
    expect(wrapLabel('one two three four five six', 9, 2)).toEqual(['one two', 'three…']);
    expect(wrapLabel('', 10, 2)).toEqual(['']);
  });
});

describe('forest plot layouts', () => {
  it('shows a long label whole (wrapped), not cut, and keeps the full label in the hover text', () => {
    const long = 'Looming discs and the dilation of perceived duration in a reproduction task (older)';
    const rand = mulberry32(3);
    const fig = forestFigure(input(3, { studies: [study(0, rand, long), study(1, rand), study(2, rand)] }));
    for (const f of [fig, fig.narrow!]) {
      const labels = trace(f, 'labels')!;
      const shown = lines((labels.text as string[])[0]).join(' ');
      expect(shown.startsWith(long)).toBe(true);
      expect((labels.hovertext as string[])[0]).toBe(long);
      expect(labels.hoverinfo).toBe('text');
    }
    const cut = 'word '.repeat(60).trim();
    const cutFig = forestFigure(input(1, { studies: [study(0, rand, cut)] }));
    expect((trace(cutFig, 'labels')!.text as string[])[0]).toMatch(/…$/);
    expect((trace(cutFig, 'labels')!.hovertext as string[])[0]).toBe(cut);
  });

  it('no two lines overprint, wide or narrow, with subgroups, wrapped labels and a prediction interval', () => {
    const rand = mulberry32(7);
    const studies = Array.from({ length: 30 }, (_, i) => study(i, rand, i % 3 ? `Lab ${i}` : `A long invented title number ${i} about flicker, numerosity and the stretching of brief intervals`));
    const subgroups = [
      { key: 'a', label: 'Visual', estimate: 0.2, ci_lower: 0.1, ci_upper: 0.3 },
      { key: 'b', label: 'Auditory', estimate: 0.4, ci_lower: 0.3, ci_upper: 0.5 },
    ];
    const fig = forestFigure(input(30, { studies, subgroups }));
    for (const [form, f] of [['wide', fig], ['narrow', fig.narrow!]] as const) {
      // text bands of one column (x axis and x position) never overlap; marks sit on lines of their own in the narrow form
      const cols = new Map<string, Band[]>();
      for (const b of bands(f)) cols.set(b.column, [...(cols.get(b.column) ?? []), b]);
      for (const [key, b] of cols) {
        const sorted = [...b].sort((p, q) => q.hi - p.hi);
        for (let i = 1; i < sorted.length; i++) expect(sorted[i].hi, `${form} ${key}: "${sorted[i].what}" under "${sorted[i - 1].what}"`).toBeLessThanOrEqual(sorted[i - 1].lo + 1e-9);
      }
      if (form === 'narrow') {
        const labels = bands({ data: [trace(f, 'labels')!], layout: {} });
        const marks = [...(trace(f, 'Studies')!.y as number[]), ...byMeta(f, 'subgroup').map((d) => (d.y as number[])[0])];
        for (const y of marks) for (const b of labels) expect(y <= b.lo - 0.5 + 1e-9 || y >= b.hi + 0.5 - 1e-9, `a mark at ${y} inside "${b.what}"`).toBe(true);
      }
    }
  });

  it('the narrow form puts year, n and weight in the label line and draws two columns', () => {
    const fig = forestFigure(input(3));
    const n = fig.narrow!;
    expect(trace(n, 'years')).toBeUndefined();
    expect(trace(n, 'weights')).toBeUndefined();
    expect((trace(n, 'labels')!.text as string[])[0]).toMatch(/^Invented lab 0 and colleagues \(2000, n = 12, 1\.7%\)$/);
    expect((n.layout.xaxis2 as { domain: number[] }).domain).toEqual([0, 1]);
    expect(n.narrow).toBeUndefined();
    expect((n.layout.height as number)).toBeGreaterThan(260);
  });

  it(`repeats the axis at the top above ${FOREST_TOP_AXIS_ROWS} rows, with the same range`, () => {
    const few = forestFigure(input(20));
    expect(few.layout.xaxis4).toBeUndefined();
    expect(byMeta(few, 'top-axis')).toHaveLength(0);
    const many = forestFigure(input(60));
    for (const f of [many, many.narrow!]) {
      const top = f.layout.xaxis4 as { side: string; overlaying: string; range: number[] };
      expect(top.side).toBe('top');
      expect(top.overlaying).toBe('x');
      expect(top.range).toEqual((f.layout.xaxis as { range: number[] }).range);
      expect(byMeta(f, 'top-axis')).toHaveLength(1);
      expect((f.layout.margin as { t: number }).t).toBeGreaterThan((few.layout.margin as { t: number }).t);
    }
  });

  it('a subgroup diamond that runs past the axis is clipped there and marked with an arrow', () => {
    const subgroups = [
      { key: 'a', label: 'Visual', estimate: 0.3, ci_lower: -40, ci_upper: 0.5 },
      { key: 'b', label: 'Auditory', estimate: 0.3, ci_lower: 0.1, ci_upper: 0.5 },
    ];
    const fig = forestFigure(input(20, { subgroups }));
    for (const f of [fig, fig.narrow!]) {
      const [lo] = (f.layout.xaxis as { range: number[] }).range;
      const [visual, auditory] = byMeta(f, 'subgroup');
      expect(Math.min(...(visual.x as number[]))).toBe(lo);
      const [left] = byMeta(f, 'arrows');
      const vy = (visual.y as number[])[0];
      expect(left.x as number[]).toContain(lo);
      expect(left.y as number[]).toContain(vy);
      expect(left.y as number[]).not.toContain((auditory.y as number[])[0]);
    }
  });

  it('has one title, in the layout (the screen leaves it to the caption; downloads draw it)', () => {
    const fig = forestFigure(input(5));
    const texts = fig.data.flatMap((t) => (Array.isArray(t.text) ? (t.text as string[]) : [String(t.text ?? '')]));
    expect(texts.some((t) => /Forest plot/.test(t))).toBe(false);
    expect((fig.layout.title as { text: string }).text).toBe('Forest plot');
  });
});
