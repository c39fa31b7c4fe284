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

/** Evenly spaced subset by SE order (ties in input order), so a huge funnel keeps its shape. */
function thin<T>(items: T[], max: number, key: (t: T) => number): T[] {
  if (items.length <= max) return items;
  const keys = Float64Array.from(items, key);
  // indices, not the items, are sorted: a numeric comparator over typed arrays
  const order = new Uint32Array(items.length).map((_, i) => i).sort((a, b) => keys[a] - keys[b] || a - b);
  const step = order.length / max;
  return Array.from({ length: max }, (_, i) => items[order[Math.floor(i * step)]]);
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
