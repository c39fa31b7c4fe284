import { normalTwoTailed } from '../stats/normal.js';
import type { PsychometricFit, SimultaneityFit } from '../psychophysics/index.js';
import type { PlotFigure } from '../synthesis/types.js';
import { PLOT_COLORS as C, baseLayout, fmt, titleLayout } from './theme.js';

/** One participant × condition: the tested levels, trials and reference responses, and the fit. */
export interface ProportionCell {
  condition: string;
  x: number[];
  n: number[];
  k: number[];
  fit: PsychometricFit | SimultaneityFit;
}

export interface ProportionInput {
  title: string;
  /** what a response of 1 means, for the y axis */
  responseLabel: string;
  cells: ProportionCell[];
  /** points on each fitted curve */
  resolution?: number;
}

const CONDITION_COLORS = [C.action, C.pooledDark, C.ink, C.inkSoft];
const CONDITION_DASHES = ['solid', 'dash', 'dot', 'dashdot'];

const phi = (z: number) => (z < 0 ? 0.5 * normalTwoTailed(z) : 1 - 0.5 * normalTwoTailed(z));

/**
 * The fitted probability of the reference response at x: (1 − λ)·F((x − PSE)/spread) with F the standard
 * normal or logistic distribution, or A·exp(−(x − μ)²/(2σ²)) for a simultaneity window; null without a fit.
 */
export function fittedProbability(fit: PsychometricFit | SimultaneityFit, x: number): number | null {
  if (!fit.converged) return null;
  if ('pse' in fit) {
    if (fit.pse === null || fit.spread === null || fit.spread === 0) return null;
    const z = (x - fit.pse) / fit.spread;
    const f = fit.model === 'logistic' ? 1 / (1 + Math.exp(-z)) : phi(z);
    return (1 - (fit.lapse ?? 0)) * f;
  }
  if (fit.centre === null || fit.sigma === null || fit.amplitude === null) return null;
  return fit.amplitude * Math.exp(-((x - fit.centre) ** 2) / (2 * fit.sigma * fit.sigma));
}

/**
 * Observed proportions (k/n per level, marker area by trials) with each condition's fitted curve, one colour
 * and line style per condition so the two stay apart in grey print.
 */
export function proportionsFigure(input: ProportionInput): PlotFigure {
  const steps = input.resolution ?? 121;
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of input.cells) {
    for (const x of c.x) {
      lo = Math.min(lo, x);
      hi = Math.max(hi, x);
    }
  }
  if (!Number.isFinite(lo)) {
    lo = 0;
    hi = 1;
  }
  const data: Array<Record<string, unknown>> = [];
  input.cells.forEach((c, i) => {
    const color = CONDITION_COLORS[i % CONDITION_COLORS.length];
    const maxN = Math.max(1, ...c.n);
    data.push({
      type: 'scatter',
      mode: 'markers',
      name: `${c.condition}: observed`,
      x: c.x,
      y: c.x.map((_, j) => (c.n[j] > 0 ? c.k[j] / c.n[j] : null)),
      text: c.x.map((x, j) => `${c.condition}, ${fmt(x, 0)} ms: ${c.k[j]} of ${c.n[j]}`),
      hoverinfo: 'text',
      marker: { color, size: c.n.map((n) => 5 + 7 * Math.sqrt(n / maxN)), symbol: i % 2 ? 'diamond' : 'circle', line: { color: C.paper, width: 0.5 } },
      meta: `observed-${i}`,
    });
    const xs = Array.from({ length: steps }, (_, s) => lo + ((hi - lo) * s) / (steps - 1));
    const ys = xs.map((x) => fittedProbability(c.fit, x));
    if (ys.some((y) => y !== null)) {
      data.push({
        type: 'scatter',
        mode: 'lines',
        name: `${c.condition}: fitted`,
        x: xs,
        y: ys,
        hoverinfo: 'skip',
        line: { color, width: 1.8, dash: CONDITION_DASHES[i % CONDITION_DASHES.length] },
        meta: `fitted-${i}`,
      });
    }
  });
  return {
    data,
    layout: {
      ...baseLayout(320),
      showlegend: true,
      legend: { orientation: 'h', y: -0.25, font: { size: 10 } },
      title: titleLayout(input.title),
      margin: { l: 52, r: 12, t: 36, b: 70 },
      xaxis: { title: { text: 'level (ms)' }, zeroline: true, zerolinecolor: C.edge, gridcolor: C.edge },
      yaxis: { title: { text: input.responseLabel }, range: [-0.03, 1.03], gridcolor: C.edge },
    },
  };
}
