import { PLOT_COLORS as C, baseLayout, fmt, metricDigits, titleLayout } from './theme.js';
import type { PlotFigure } from '../synthesis/types.js';

export interface BubbleInput {
  title?: string;
  metric: string;
  metricLabel: string;
  moderatorLabel: string;
  points: Array<{ label: string; x: number; effect: number; weight: number }>;
  fit: { intercept: number; slope: number; slope_p: number } | null;
}

/** A bubble plot for a one-moderator meta-regression: effect against the moderator, area ∝ weight, the fitted line. */
export function bubbleFigure(input: BubbleInput): PlotFigure {
  const digits = metricDigits(input.metric);
  const xs = input.points.map((p) => p.x);
  let maxW = 1e-9;
  let x0 = Infinity;
  let x1 = -Infinity;
  for (const p of input.points) {
    if (p.weight > maxW) maxW = p.weight;
    if (p.x < x0) x0 = p.x;
    if (p.x > x1) x1 = p.x;
  }
  const data: Array<Record<string, unknown>> = [
    {
      type: 'scatter',
      mode: 'markers',
      x: xs,
      y: input.points.map((p) => p.effect),
      text: input.points.map((p) => `${p.label}<br>${fmt(p.x, 0)} → ${fmt(p.effect, digits)}, weight ${fmt(p.weight, 1)}%`),
      hoverinfo: 'text',
      marker: { symbol: 'circle-open', size: input.points.map((p) => 6 + 26 * Math.sqrt(p.weight / maxW)), color: C.ink, line: { width: 1.2 } },
      name: 'Studies',
      meta: 'studies',
    },
  ];
  if (input.fit)
    data.push({
      type: 'scatter',
      mode: 'lines',
      x: [x0, x1],
      y: [input.fit.intercept + input.fit.slope * x0, input.fit.intercept + input.fit.slope * x1],
      line: { color: C.pooled, width: 2 },
      hoverinfo: 'text',
      text: `slope ${input.fit.slope.toPrecision(3)} per unit, p = ${fmt(input.fit.slope_p, 3)}`,
      name: 'Meta-regression fit',
      meta: 'fit',
    });
  return {
    data,
    layout: {
      ...baseLayout(400),
      title: titleLayout(input.title ?? `Meta-regression on ${input.moderatorLabel.toLowerCase()}`),
      margin: { l: 60, r: 16, t: 40, b: 56 },
      xaxis: { title: { text: input.moderatorLabel }, zeroline: false, showgrid: false, showline: true, linecolor: C.inkFaint, ticks: 'outside' },
      yaxis: { title: { text: input.metricLabel }, zeroline: true, zerolinecolor: C.edge, showgrid: false, showline: true, linecolor: C.inkFaint, ticks: 'outside' },
    },
  };
}
