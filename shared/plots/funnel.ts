import { PLOT_COLORS as C, baseLayout, fmt, metricDigits, titleLayout } from './theme.js';
import type { PlotFigure } from '../synthesis/types.js';

export interface FunnelInput {
  title?: string;
  metric: string;
  metricLabel: string;
  studies: Array<{ label: string; effect: number; variance: number }>;
  pooled: number;
  trimFill?: { estimate: number; filled: Array<{ effect: number; variance: number }> } | null;
  /** draw the trim-and-fill points (the trace is always present, hidden unless asked) */
  showTrimFill?: boolean;
  maxPoints?: number;
}

export const FUNNEL_MAX_POINTS = 2000;
const Z95 = 1.959963984540054;

/**
 * Evenly spaced subset by SE order (ties in input order), so a huge funnel keeps its shape. The keys are
 * sorted natively; the picked ranks name a value and a place among its ties, found in one pass over the items.
 */
function thin<T>(items: T[], max: number, key: (t: T) => number): T[] {
  if (items.length <= max) return items;
  const keys = Float64Array.from(items, key);
  const sorted = keys.slice().sort();
  const step = items.length / max;
  const values: number[] = []; // distinct picked values, increasing
  const wanted: number[][] = []; // per value: the picked places among its ties, increasing
  const slots: number[][] = []; // per value: which pick each place fills
  let first = 0;
  for (let i = 0; i < max; i++) {
    const r = Math.floor(i * step);
    const q = sorted[r];
    if (values[values.length - 1] !== q) {
      while (sorted[first] < q) first++;
      values.push(q);
      wanted.push([]);
      slots.push([]);
    }
    wanted[values.length - 1].push(r - first);
    slots[values.length - 1].push(i);
  }
  const seen = new Int32Array(values.length);
  const next = new Int32Array(values.length);
  const out = new Array<T>(max);
  for (let i = 0; i < keys.length; i++) {
    let lo = 0, hi = values.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (values[mid] < keys[i]) lo = mid + 1;
      else hi = mid;
    }
    if (values[lo] !== keys[i]) continue;
    const place = seen[lo]++;
    if (wanted[lo][next[lo]] === place) out[slots[lo][next[lo]++]] = items[i];
  }
  return out;
}

/**
 * A funnel plot: each study's effect against its standard error (SE axis inverted, precise studies on
 * top), pseudo-95% limits pooled ± 1.96·SE around the pooled value, and trim-and-fill's imputed studies
 * as open circles with the adjusted estimate (shown on request).
 */
export function funnelFigure(input: FunnelInput): PlotFigure {
  const digits = metricDigits(input.metric);
  const pts = thin(input.studies, input.maxPoints ?? FUNNEL_MAX_POINTS, (s) => s.variance);
  const filled = input.trimFill?.filled ?? [];
  let maxV = 1e-18;
  for (const s of input.studies) if (s.variance > maxV) maxV = s.variance;
  for (const f of filled) if (f.variance > maxV) maxV = f.variance;
  const maxSe = Math.sqrt(maxV) * 1.08;
  const m = input.pooled;
  const show = !!input.showTrimFill;
  const data: Array<Record<string, unknown>> = [
    {
      type: 'scatter',
      mode: 'lines',
      x: [m - Z95 * maxSe, m, m + Z95 * maxSe],
      y: [maxSe, 0, maxSe],
      line: { color: C.inkFaint, width: 1, dash: 'dash' },
      hoverinfo: 'skip',
      name: 'Pseudo-95% limits',
      meta: 'contour',
    },
    {
      type: 'scatter',
      mode: 'lines',
      x: [m, m],
      y: [0, maxSe],
      line: { color: C.pooled, width: 1.5 },
      hoverinfo: 'text',
      text: `Pooled ${fmt(m, digits)}`,
      name: 'Pooled estimate',
      meta: 'pooled',
    },
    {
      type: 'scatter',
      mode: 'markers',
      x: pts.map((s) => s.effect),
      y: pts.map((s) => Math.sqrt(s.variance)),
      text: pts.map((s) => `${s.label}<br>${fmt(s.effect, digits)}, SE ${fmt(Math.sqrt(s.variance), 3)}`),
      hoverinfo: 'text',
      marker: { symbol: 'circle', size: 6, color: C.ink, opacity: pts.length > 500 ? 0.5 : 0.85 },
      name: 'Studies',
      meta: 'studies',
    },
    {
      type: 'scatter',
      mode: 'markers',
      x: filled.map((f) => f.effect),
      y: filled.map((f) => Math.sqrt(f.variance)),
      text: filled.map((f) => `Imputed ${fmt(f.effect, digits)}, SE ${fmt(Math.sqrt(f.variance), 3)}`),
      hoverinfo: 'text',
      marker: { symbol: 'circle-open', size: 7, color: C.inkSoft, line: { width: 1.5 } },
      name: 'Imputed by trim-and-fill',
      meta: 'trimfill',
      visible: show,
    },
    {
      type: 'scatter',
      mode: 'lines',
      x: input.trimFill ? [input.trimFill.estimate, input.trimFill.estimate] : [],
      y: [0, maxSe],
      line: { color: C.pooledDark, width: 1, dash: 'dot' },
      hoverinfo: 'text',
      text: input.trimFill ? `Adjusted by trim-and-fill ${fmt(input.trimFill.estimate, digits)}` : '',
      name: 'Trim-and-fill estimate',
      meta: 'trimfill',
      visible: show,
    },
  ];
  const annotations =
    pts.length < input.studies.length
      ? [{ xref: 'paper', yref: 'paper', x: 0, y: 0, yshift: -48, xanchor: 'left', showarrow: false, text: `Showing ${pts.length} of ${input.studies.length} studies, evenly spaced by SE.`, font: { size: 11, color: C.inkSoft } }]
      : [];
  return {
    data,
    layout: {
      ...baseLayout(420),
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: -0.18, font: { size: 11 } },
      title: titleLayout(input.title ?? 'Funnel plot'),
      margin: { l: 60, r: 16, t: 40, b: 90 },
      xaxis: { title: { text: input.metricLabel }, zeroline: false, showgrid: false, showline: true, linecolor: C.inkFaint, ticks: 'outside' },
      yaxis: { title: { text: 'Standard error' }, range: [maxSe, 0], zeroline: false, showgrid: true, gridcolor: C.paperDeep, showline: true, linecolor: C.inkFaint, ticks: 'outside' },
      annotations,
    },
  };
}
