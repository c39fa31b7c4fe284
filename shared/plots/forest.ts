import { normalQuantileUpper } from '../stats/normal.js';
import { PLOT_COLORS as C, baseLayout, fmt, metricDigits, noEffectValue, titleLayout } from './theme.js';
import type { PlotFigure } from '../synthesis/types.js';

export interface ForestStudy {
  label: string;
  year: number | null;
  n: number | null;
  effect: number;
  variance: number;
  /** percent */
  weight: number;
  group?: string;
}

export interface ForestSummary {
  label: string;
  /** subgroups: the value the studies' `group` holds (label is what is shown) */
  key?: string;
  estimate: number;
  ci_lower: number;
  ci_upper: number;
  pi_lower?: number | null;
  pi_upper?: number | null;
}

export interface ForestInput {
  title?: string;
  metric: string;
  metricLabel: string;
  level: number;
  studies: ForestStudy[];
  pooled: ForestSummary;
  /** one diamond per subgroup, keyed by the studies' `group` */
  subgroups?: ForestSummary[];
  /** rows beyond this are left out (largest weights kept) with a note */
  maxRows?: number;
  /** "paper": the groups are papers (three-level model), each closed by its paper-level line; groups left
   * without a row after the cut are not drawn */
  grouping?: 'subgroup' | 'paper';
  /** the caller already kept the rows with the largest weights: this many more were left out */
  omitted?: number;
  /** what a row is, for the note on left-out rows (default "studies") */
  rowNoun?: string;
}

export const FOREST_MAX_ROWS = 300;
/** Above this many rows the effect axis is drawn at the top as well as at the bottom. */
export const FOREST_TOP_AXIS_ROWS = 40;
/** Below this width (px) a figure's `narrow` variant is drawn instead (src/features/plots/components/PlotFigure.tsx). */
export const NARROW_FIGURE_PX = 900;
const LINE_PX = { wide: 17, narrow: 15 };
const LABEL_CHARS = { wide: 44, narrow: 52 };
const LABEL_LINES = { wide: 2, narrow: 3 };

/** A label broken at spaces into lines of at most `width` characters, at most `max` lines (the last one ends in … when cut). */
export function wrapLabel(text: string, width: number, max: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
    let w = word;
    while (w.length > width) {
      if (line) lines.push(line);
      lines.push(w.slice(0, width));
      w = w.slice(width);
      line = '';
    }
    if (!line) line = w;
    else if (line.length + 1 + w.length <= width) line += ` ${w}`;
    else {
      lines.push(line);
      line = w;
    }
  }
  if (line || !lines.length) lines.push(line);
  if (lines.length <= max) return lines;
  const kept = lines.slice(0, max);
  const last = kept[max - 1];
  kept[max - 1] = `${last.length >= width ? last.slice(0, width - 1) : last}…`;
  return kept;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

function quantile(sorted: number[], q: number) {
  if (!sorted.length) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.floor(q * (sorted.length - 1))));
  return sorted[i];
}

/**
 * A forest plot as a Plotly figure: one row per study (label, year, n, effect with CI, weight), squares
 * sized by weight, CI whiskers (clipped ends drawn as arrows, diamonds' too), subgroup diamonds, the pooled
 * diamond with the prediction interval as a thin bar beneath it, and a vertical line at no effect. Long labels
 * wrap (the full label is in the row's hover text); more than FOREST_TOP_AXIS_ROWS rows repeat the axis at the
 * top. `narrow` is the same plot for a phone: each label on its own line above its row, two columns only.
 */
export function forestFigure(input: ForestInput): PlotFigure {
  return { ...forestLayout(input, 'wide'), narrow: forestLayout(input, 'narrow') };
}

function forestLayout(input: ForestInput, form: 'wide' | 'narrow'): PlotFigure {
  const z = normalQuantileUpper((1 - input.level) / 2);
  const digits = metricDigits(input.metric);
  const maxRows = input.maxRows ?? FOREST_MAX_ROWS;
  let studies = input.studies;
  let omitted = input.omitted ?? 0;
  if (studies.length > maxRows) {
    const keep = new Set([...studies].sort((a, b) => b.weight - a.weight).slice(0, maxRows));
    studies = studies.filter((s) => keep.has(s));
    omitted += input.studies.length - studies.length;
  }
  const grouped = !!input.subgroups?.length;
  const byPaper = input.grouping === 'paper';
  const summaries = new Map((input.subgroups ?? []).map((g) => [g.key ?? g.label, g]));
  const buckets = new Map<string, ForestStudy[]>();
  for (const s of studies) {
    const g = grouped ? (s.group ?? '') : '';
    const b = buckets.get(g);
    if (b) b.push(s);
    else buckets.set(g, [s]);
  }
  const groups = grouped ? [...summaries.keys()].filter((g) => !byPaper || buckets.has(g)) : [''];

  // Rows top to bottom; y = −index.
  type Row = { kind: 'study'; s: ForestStudy; lo: number; hi: number } | { kind: 'header'; text: string } | { kind: 'diamond'; d: ForestSummary; sub: boolean } | { kind: 'pi'; d: ForestSummary } | { kind: 'gap' };
  const rows: Row[] = [];
  for (const g of groups) {
    const summaryOf = grouped ? summaries.get(g)! : null;
    if (summaryOf) rows.push({ kind: 'header', text: summaryOf.label });
    for (const s of buckets.get(g) ?? []) {
      const half = z * Math.sqrt(s.variance);
      rows.push({ kind: 'study', s, lo: s.effect - half, hi: s.effect + half });
    }
    if (summaryOf) {
      const d = summaryOf;
      rows.push({ kind: 'diamond', d: { ...d, label: byPaper ? `Paper estimate` : `Subgroup: ${d.label}` }, sub: true });
      if (!byPaper) rows.push({ kind: 'gap' });
    }
  }
  if (!grouped) rows.push({ kind: 'gap' });
  rows.push({ kind: 'diamond', d: input.pooled, sub: false });
  const hasPi = input.pooled.pi_lower != null && input.pooled.pi_upper != null;
  if (hasPi) rows.push({ kind: 'pi', d: input.pooled });

  // Axis range: the spread of the CIs (trimmed when many rows, so one huge interval does not flatten the rest).
  const los = rows.flatMap((r) => (r.kind === 'study' ? [r.lo] : [])).sort((a, b) => a - b);
  const his = rows.flatMap((r) => (r.kind === 'study' ? [r.hi] : [])).sort((a, b) => a - b);
  const trim = los.length >= 20 ? 0.03 : 0;
  const p = input.pooled;
  let lo = Math.min(quantile(los, trim), p.ci_lower, hasPi ? p.pi_lower! : Infinity);
  let hi = Math.max(quantile(his, 1 - trim), p.ci_upper, hasPi ? p.pi_upper! : -Infinity);
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) {
    lo = p.ci_lower;
    hi = p.ci_upper;
  }
  const nul = noEffectValue(input.metric);
  const span0 = hi - lo || Math.abs(hi) || 1;
  if (nul !== null && nul >= lo - span0 && nul <= hi + span0) {
    lo = Math.min(lo, nul);
    hi = Math.max(hi, nul);
  }
  const span = hi - lo || 1;
  lo -= span * 0.05;
  hi += span * 0.05;

  const narrow = form === 'narrow';
  const width = LABEL_CHARS[form];
  const sq = { x: [] as number[], y: [] as number[], size: [] as number[], text: [] as string[] };
  const wx: Array<number | null> = [];
  const wy: Array<number | null> = [];
  const arrowsL = { x: [] as number[], y: [] as number[] };
  const arrowsR = { x: [] as number[], y: [] as number[] };
  const col = () => ({ y: [] as number[], text: [] as string[], hover: [] as string[] });
  const colLabel = col();
  const colYear = col();
  const colN = col();
  const colCi = col();
  const colW = col();
  const diamonds: Array<Record<string, unknown>> = [];
  let maxW = 1e-9;
  for (const s of studies) if (s.weight > maxW) maxW = s.weight;

  // Rows are placed from the top in lines: a wrapped label takes a line per piece; on a phone the label sits on
  // its own lines above the row's marks. `cursor` is the next free line (y falls by one per line).
  let cursor = 0;
  const place = (label: string, bold: boolean, full = label) => {
    const lines = wrapLabel(label, width, LABEL_LINES[form]).map((l) => (bold ? `<b>${esc(l)}</b>` : esc(l)));
    const u = lines.length;
    const labelY = narrow ? cursor - (u - 1) / 2 : cursor - (u - 1) / 2;
    const markY = narrow ? cursor - u : labelY;
    cursor -= narrow ? u + 1 : u;
    colLabel.y.push(labelY);
    colLabel.text.push(lines.join('<br>'));
    colLabel.hover.push(esc(full));
    return markY;
  };
  const clipped = (y: number, a: number, b: number) => {
    if (a < lo) {
      arrowsL.x.push(lo);
      arrowsL.y.push(y);
    }
    if (b > hi) {
      arrowsR.x.push(hi);
      arrowsR.y.push(y);
    }
  };
  const addCol = (c: ReturnType<typeof col>, y: number, text: string) => {
    c.y.push(y);
    c.text.push(text);
  };

  for (const r of rows) {
    if (r.kind === 'gap') {
      cursor -= 1;
    } else if (r.kind === 'header') {
      place(r.text, true);
    } else if (r.kind === 'study') {
      const { s } = r;
      const about = narrow ? ` (${[s.year ?? '', s.n == null ? '' : `n = ${s.n}`, `${fmt(s.weight, 1)}%`].filter(Boolean).join(', ')})` : '';
      const y = place(`${s.label}${about}`, false, s.label);
      sq.x.push(s.effect);
      sq.y.push(y);
      sq.size.push((narrow ? 4 : 5) + (narrow ? 9 : 13) * Math.sqrt(s.weight / maxW));
      sq.text.push(`${esc(s.label)}<br>${fmt(s.effect, digits)} [${fmt(r.lo, digits)}, ${fmt(r.hi, digits)}]<br>weight ${fmt(s.weight, 1)}%`);
      wx.push(Math.max(r.lo, lo), Math.min(r.hi, hi), null);
      wy.push(y, y, null);
      clipped(y, r.lo, r.hi);
      if (!narrow) {
        addCol(colYear, y, s.year == null ? '—' : String(s.year));
        addCol(colN, y, s.n == null ? '—' : String(s.n));
        addCol(colW, y, fmt(s.weight, 1));
      }
      addCol(colCi, y, `${fmt(s.effect, digits)} [${fmt(r.lo, digits)}, ${fmt(r.hi, digits)}]`);
    } else if (r.kind === 'diamond') {
      const d = r.d;
      const y = place(d.label, true);
      const h = narrow ? 0.3 : r.sub ? 0.32 : 0.42;
      diamonds.push({
        type: 'scatter',
        mode: 'lines',
        x: [Math.max(d.ci_lower, lo), d.estimate, Math.min(d.ci_upper, hi), d.estimate, Math.max(d.ci_lower, lo)],
        y: [y, y + h, y, y - h, y],
        fill: 'toself',
        fillcolor: r.sub ? C.pooledLight : C.pooled,
        line: { color: r.sub ? C.pooled : C.pooledDark, width: 1 },
        hoverinfo: 'text',
        text: `${esc(d.label)}: ${fmt(d.estimate, digits)} [${fmt(d.ci_lower, digits)}, ${fmt(d.ci_upper, digits)}]`,
        hoveron: 'fills',
        name: d.label,
        meta: r.sub ? (byPaper ? 'paper' : 'subgroup') : 'pooled',
      });
      // a diamond that runs past the axis is marked like a clipped interval
      clipped(y, d.ci_lower, d.ci_upper);
      addCol(colCi, y, `<b>${fmt(d.estimate, digits)} [${fmt(d.ci_lower, digits)}, ${fmt(d.ci_upper, digits)}]</b>`);
      if (!narrow) addCol(colW, y, r.sub ? '' : '100.0');
    } else if (r.kind === 'pi') {
      const d = r.d;
      const y = narrow ? place('Prediction interval', false) : cursor;
      if (!narrow) {
        colLabel.y.push(y);
        colLabel.text.push('Prediction interval');
        colLabel.hover.push('Prediction interval');
        cursor -= 1;
      }
      diamonds.push({
        type: 'scatter',
        mode: 'lines',
        x: [Math.max(d.pi_lower!, lo), Math.min(d.pi_upper!, hi)],
        y: [y, y],
        line: { color: C.pooledDark, width: 3 },
        hoverinfo: 'text',
        text: `Prediction interval ${fmt(d.pi_lower, digits)} to ${fmt(d.pi_upper, digits)}`,
        name: 'Prediction interval',
        meta: 'prediction',
      });
      clipped(y, d.pi_lower!, d.pi_upper!);
      addCol(colCi, y, `[${fmt(d.pi_lower, digits)}, ${fmt(d.pi_upper, digits)}]`);
    }
  }
  const bottom = cursor + 1;

  const header = 1;
  const textTrace = (axis: 'x2' | 'x3', x: number, c: ReturnType<typeof col>, position: string, name: string) => ({
    type: 'scatter',
    mode: 'text',
    xaxis: axis,
    x: c.y.map(() => x),
    y: c.y,
    text: c.text,
    textposition: position,
    textfont: { size: narrow ? 10 : 11, color: C.ink },
    ...(c.hover.length ? { hovertext: c.hover, hoverinfo: 'text' } : { hoverinfo: 'skip' }),
    cliponaxis: false,
    name,
  });
  const headerTrace = (axis: 'x2' | 'x3', x: number[], text: string[], position: string[]) => ({
    type: 'scatter',
    mode: 'text',
    xaxis: axis,
    x,
    y: x.map(() => header),
    text,
    textposition: position,
    textfont: { size: narrow ? 10 : 11, color: C.ink },
    hoverinfo: 'skip',
    cliponaxis: false,
  });
  const ciHead = `<b>${esc(input.metricLabel)} [${Math.round(input.level * 100)}% CI]</b>`;
  // Columns: wide = labels | year | n | plot | estimate | weight; narrow = plot | estimate, the labels across the top of each row.
  const ciX = narrow ? 1 : 0.78;
  const texts = narrow
    ? [
        textTrace('x2', 0, colLabel, 'middle right', 'labels'),
        textTrace('x3', ciX, colCi, 'middle left', 'estimates'),
        headerTrace('x2', [0], ['<b>Study (year, n, weight)</b>'], ['middle right']),
        headerTrace('x3', [ciX], [`<b>${Math.round(input.level * 100)}% CI</b>`], ['middle left']),
      ]
    : [
        textTrace('x2', 0, colLabel, 'middle right', 'labels'),
        textTrace('x2', 0.8, colYear, 'middle left', 'years'),
        textTrace('x2', 1, colN, 'middle left', 'n'),
        textTrace('x3', ciX, colCi, 'middle left', 'estimates'),
        textTrace('x3', 1, colW, 'middle left', 'weights'),
        headerTrace('x2', [0, 0.8, 1], ['<b>Study</b>', '<b>Year</b>', '<b>n</b>'], ['middle right', 'middle left', 'middle left']),
        headerTrace('x3', [0.78, 1], [ciHead, '<b>Weight %</b>'], ['middle left', 'middle left']),
      ];

  const topAxis = rows.length > FOREST_TOP_AXIS_ROWS;
  const data: Array<Record<string, unknown>> = [
    { type: 'scatter', mode: 'lines', x: wx, y: wy, line: { color: C.inkSoft, width: 1 }, hoverinfo: 'skip', name: 'CI', meta: 'whiskers' },
    {
      type: 'scatter',
      mode: 'markers',
      x: sq.x,
      y: sq.y,
      marker: { symbol: 'square', size: sq.size, color: C.ink, line: { width: 0 } },
      text: sq.text,
      hoverinfo: 'text',
      name: 'Studies',
      meta: 'studies',
    },
    { type: 'scatter', mode: 'markers', x: arrowsL.x, y: arrowsL.y, marker: { symbol: 'triangle-left', size: 8, color: C.inkSoft }, hoverinfo: 'skip', cliponaxis: false, name: 'CI continues left', meta: 'arrows' },
    { type: 'scatter', mode: 'markers', x: arrowsR.x, y: arrowsR.y, marker: { symbol: 'triangle-right', size: 8, color: C.inkSoft }, hoverinfo: 'skip', cliponaxis: false, name: 'CI continues right', meta: 'arrows' },
    ...diamonds,
    ...texts,
  ];
  // the top axis needs a trace of its own to be drawn: two invisible points at the ends of the range
  if (topAxis) data.push({ type: 'scatter', mode: 'markers', xaxis: 'x4', x: [lo, hi], y: [header, header], marker: { opacity: 0 }, hoverinfo: 'skip', name: 'top axis', meta: 'top-axis' });

  const shapes: Array<Record<string, unknown>> = [
    { type: 'line', xref: 'x', yref: 'y', x0: input.pooled.estimate, x1: input.pooled.estimate, y0: 0.5, y1: bottom, line: { color: C.pooled, width: 1, dash: 'dot' } },
  ];
  if (nul !== null && nul >= lo && nul <= hi)
    shapes.push({ type: 'line', xref: 'x', yref: 'y', x0: nul, x1: nul, y0: header - 0.4, y1: bottom - 0.5, line: { color: C.inkFaint, width: 1 } });

  const annotations: Array<Record<string, unknown>> = [];
  if (omitted > 0)
    annotations.push({
      xref: 'paper',
      yref: 'paper',
      x: 0,
      y: 0,
      yshift: -44,
      xanchor: 'left',
      showarrow: false,
      text: `Showing the ${studies.length} ${input.rowNoun ?? 'studies'} with the largest weights; ${omitted} more are in the pooled estimate and the CSV export.`,
      font: { size: 11, color: C.inkSoft },
    });

  const lines = header - bottom + 2;
  const top = topAxis ? 64 : 24;
  const height = Math.max(260, lines * LINE_PX[form] + top + (omitted ? 70 : 50));
  const plotDomain = narrow ? [0, 0.6] : [0.4, 0.72];
  const axisStyle = { range: [lo, hi], zeroline: false, showgrid: false, showline: true, linecolor: C.inkFaint, ticks: 'outside', tickcolor: C.inkFaint };
  const layout = {
    ...baseLayout(height),
    title: titleLayout(input.title ?? 'Forest plot'),
    margin: { l: 8, r: 8, t: top, b: omitted ? 70 : 50 },
    xaxis: { ...axisStyle, domain: plotDomain, title: { text: esc(input.metricLabel), font: { size: 11 } }, fixedrange: false },
    xaxis2: { domain: [0, narrow ? 1 : 0.38], range: [0, 1], visible: false, fixedrange: true },
    xaxis3: { domain: [narrow ? 0.62 : 0.74, 1], range: [0, 1], visible: false, fixedrange: true },
    ...(topAxis ? { xaxis4: { ...axisStyle, overlaying: 'x', side: 'top', anchor: 'y', matches: 'x', fixedrange: false } } : {}),
    yaxis: { range: [bottom - 0.6, header + 0.6], visible: false, fixedrange: true },
    shapes,
    annotations,
  };
  return { data, layout };
}
