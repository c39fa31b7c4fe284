import { metricDigits as digitsOf } from '../vocabulary/labels.js';
import theme from '../../tailwind.config.js';

const c = theme.theme.extend.colors;

/** The product palette (tailwind.config.ts is the one source) as plot colours. */
export const PLOT_COLORS = {
  paper: c.paper.DEFAULT,
  paperDeep: c.paper.deep,
  edge: c.paper.edge,
  ink: c.ink.DEFAULT,
  inkSoft: c.ink.soft,
  inkFaint: c.ink.faint,
  action: c.action.DEFAULT,
  pooled: c.caution.DEFAULT,
  pooledLight: c.caution.light,
  pooledDark: c.caution.dark,
} as const;

const f = theme.theme.extend.fontFamily;
export const UI_FONT = f.ui.map((n) => (n.includes(' ') ? `"${n}"` : n)).join(', ');
export const READING_FONT = f.reading.map((n) => (n.includes(' ') ? `"${n}"` : n)).join(', ');

export const baseLayout = (height: number) => ({
  height,
  paper_bgcolor: PLOT_COLORS.paper,
  plot_bgcolor: PLOT_COLORS.paper,
  font: { family: UI_FONT, size: 11, color: PLOT_COLORS.ink },
  showlegend: false,
  hovermode: 'closest',
  hoverlabel: { bgcolor: PLOT_COLORS.paperDeep, bordercolor: PLOT_COLORS.edge, font: { family: UI_FONT, color: PLOT_COLORS.ink } },
});

export const titleLayout = (text: string) => ({
  text,
  x: 0,
  xanchor: 'left',
  font: { family: READING_FONT, size: 14, color: PLOT_COLORS.ink },
});

/** Fixed-precision number formatting shared by every plot label. */
export const fmt = (x: number | null | undefined, digits = 2) => (x == null || !Number.isFinite(x) ? '—' : x.toFixed(digits));

/** The value meaning "no effect" for a metric, or null when the metric has none (a raw mean). */
export function noEffectValue(metric: string): number | null {
  return metric === 'raw_mean' ? null : 0;
}

/** Digits shown for a metric's values on a plot (the one rule, shared/vocabulary/labels.ts). */
export const metricDigits = (metric: string) => digitsOf(metric, 'plot');
