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
const ROW_PX = 17;
const LABEL_CHARS = 46;

const clip = (s: string) => (s.length > LABEL_CHARS ? `${s.slice(0, LABEL_CHARS - 1)}…` : s);

function quantile(sorted: number[], q: number) {
  if (!sorted.length) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.floor(q * (sorted.length - 1))));
  return sorted[i];
}

/**
 * A forest plot as a Plotly figure: one row per study (label, year, n, effect with CI, weight), squares
 * sized by weight, CI whiskers (clipped ends drawn as arrows), subgroup diamonds, the pooled diamond with
 * the prediction interval as a thin bar beneath it, and a vertical line at no effect.
 */
export function forestFigure(input: ForestInput): PlotFigure {
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

  const sq = { x: [] as number[], y: [] as number[], size: [] as number[], text: [] as string[] };
  const wx: Array<number | null> = [];
  const wy: Array<number | null> = [];
  const arrowsL = { x: [] as number[], y: [] as number[] };
  const arrowsR = { x: [] as number[], y: [] as number[] };
  const colLabel = { y: [] as number[], text: [] as string[] };
  const colYear = { y: [] as number[], text: [] as string[] };
  const colN = { y: [] as number[], text: [] as string[] };
  const colCi = { y: [] as number[], text: [] as string[] };
  const colW = { y: [] as number[], text: [] as string[] };
  const diamonds: Array<Record<string, unknown>> = [];
  let maxW = 1e-9;
  for (const s of studies) if (s.weight > maxW) maxW = s.weight;

  rows.forEach((r, i) => {
    const y = -i;
    if (r.kind === 'header') {
      colLabel.y.push(y);
      colLabel.text.push(`<b>${clip(r.text)}</b>`);
    } else if (r.kind === 'study') {
      const { s } = r;
      sq.x.push(s.effect);
      sq.y.push(y);
      sq.size.push(5 + 13 * Math.sqrt(s.weight / maxW));
      sq.text.push(`${s.label}<br>${fmt(s.effect, digits)} [${fmt(r.lo, digits)}, ${fmt(r.hi, digits)}]<br>weight ${fmt(s.weight, 1)}%`);
      wx.push(Math.max(r.lo, lo), Math.min(r.hi, hi), null);
      wy.push(y, y, null);
      if (r.lo < lo) {
        arrowsL.x.push(lo);
        arrowsL.y.push(y);
      }
      if (r.hi > hi) {
        arrowsR.x.push(hi);
        arrowsR.y.push(y);
      }
      colLabel.y.push(y);
      colLabel.text.push(clip(s.label));
      colYear.y.push(y);
      colYear.text.push(s.year == null ? '—' : String(s.year));
      colN.y.push(y);
      colN.text.push(s.n == null ? '—' : String(s.n));
      colCi.y.push(y);
      colCi.text.push(`${fmt(s.effect, digits)} [${fmt(r.lo, digits)}, ${fmt(r.hi, digits)}]`);
      colW.y.push(y);
      colW.text.push(fmt(s.weight, 1));
    } else if (r.kind === 'diamond') {
      const d = r.d;
      const h = r.sub ? 0.32 : 0.42;
      diamonds.push({
        type: 'scatter',
        mode: 'lines',
        x: [Math.max(d.ci_lower, lo), d.estimate, Math.min(d.ci_upper, hi), d.estimate, Math.max(d.ci_lower, lo)],
        y: [y, y + h, y, y - h, y],
        fill: 'toself',
        fillcolor: r.sub ? C.pooledLight : C.pooled,
        line: { color: r.sub ? C.pooled : C.pooledDark, width: 1 },
        hoverinfo: 'text',
        text: `${d.label}: ${fmt(d.estimate, digits)} [${fmt(d.ci_lower, digits)}, ${fmt(d.ci_upper, digits)}]`,
        hoveron: 'fills',
        name: d.label,
        meta: r.sub ? (byPaper ? 'paper' : 'subgroup') : 'pooled',
      });
      colLabel.y.push(y);
      colLabel.text.push(`<b>${clip(d.label)}</b>`);
      colCi.y.push(y);
      colCi.text.push(`<b>${fmt(d.estimate, digits)} [${fmt(d.ci_lower, digits)}, ${fmt(d.ci_upper, digits)}]</b>`);
      colW.y.push(y);
      colW.text.push(r.sub ? '' : '100.0');
    } else if (r.kind === 'pi') {
      const d = r.d;
      diamonds.push({
        type: 'scatter',
        mode: 'lines',
        x: [Math.max(d.pi_lower!, lo), Math.min(d.pi_upper!, hi)],
        y: [y + 0.25, y + 0.25],
        line: { color: C.pooledDark, width: 3 },
        hoverinfo: 'text',
        text: `Prediction interval ${fmt(d.pi_lower, digits)} to ${fmt(d.pi_upper, digits)}`,
        name: 'Prediction interval',
        meta: 'prediction',
      });
      colLabel.y.push(y + 0.25);
      colLabel.text.push('Prediction interval');
      colCi.y.push(y + 0.25);
      colCi.text.push(`[${fmt(d.pi_lower, digits)}, ${fmt(d.pi_upper, digits)}]`);
    }
  });

  const header = 1;
  const textTrace = (axis: 'x2' | 'x3', x: number, col: { y: number[]; text: string[] }, position: string, name: string) => ({
    type: 'scatter',
    mode: 'text',
    xaxis: axis,
    x: col.y.map(() => x),
    y: col.y,
    text: col.text,
    textposition: position,
    textfont: { size: 11, color: C.ink },
    hoverinfo: 'skip',
    cliponaxis: false,
    name,
  });
  const headers = {
    type: 'scatter',
    mode: 'text',
    xaxis: 'x2',
    x: [0, 0.8, 1],
    y: [header, header, header],
    text: ['<b>Study</b>', '<b>Year</b>', '<b>n</b>'],
    textposition: ['middle right', 'middle left', 'middle left'],
    hoverinfo: 'skip',
    cliponaxis: false,
  };
  const headersRight = {
    type: 'scatter',
    mode: 'text',
    xaxis: 'x3',
    x: [0.78, 1],
    y: [header, header],
    text: [`<b>${input.metricLabel} [${Math.round(input.level * 100)}% CI]</b>`, '<b>Weight %</b>'],
    textposition: ['middle left', 'middle left'],
    hoverinfo: 'skip',
    cliponaxis: false,
  };

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
    textTrace('x2', 0, colLabel, 'middle right', 'labels'),
    textTrace('x2', 0.8, colYear, 'middle left', 'years'),
    textTrace('x2', 1, colN, 'middle left', 'n'),
    textTrace('x3', 0.78, colCi, 'middle left', 'estimates'),
    textTrace('x3', 1, colW, 'middle left', 'weights'),
    headers,
    headersRight,
  ];

  const shapes: Array<Record<string, unknown>> = [
    { type: 'line', xref: 'x', yref: 'y', x0: input.pooled.estimate, x1: input.pooled.estimate, y0: 0.5, y1: -(rows.length - 1), line: { color: C.pooled, width: 1, dash: 'dot' } },
  ];
  if (nul !== null && nul >= lo && nul <= hi)
    shapes.push({ type: 'line', xref: 'x', yref: 'y', x0: nul, x1: nul, y0: header - 0.4, y1: -(rows.length - 0.5), line: { color: C.inkFaint, width: 1 } });

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

  const height = Math.max(260, (rows.length + 2) * ROW_PX + 110);
  const layout = {
    ...baseLayout(height),
    title: titleLayout(input.title ?? 'Forest plot'),
    margin: { l: 8, r: 8, t: 40, b: omitted ? 70 : 50 },
    xaxis: {
      domain: [0.4, 0.72],
      range: [lo, hi],
      zeroline: false,
      showgrid: false,
      showline: true,
      linecolor: C.inkFaint,
      ticks: 'outside',
      tickcolor: C.inkFaint,
      title: { text: input.metricLabel, font: { size: 11 } },
      fixedrange: false,
    },
    xaxis2: { domain: [0, 0.38], range: [0, 1], visible: false, fixedrange: true },
    xaxis3: { domain: [0.74, 1], range: [0, 1], visible: false, fixedrange: true },
    yaxis: { range: [-(rows.length - 0.4), header + 0.6], visible: false, fixedrange: true },
    shapes,
    annotations,
  };
  return { data, layout };
}
