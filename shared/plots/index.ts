export { forestFigure, wrapLabel, FOREST_MAX_ROWS, FOREST_TOP_AXIS_ROWS, NARROW_FIGURE_PX, type ForestInput, type ForestStudy, type ForestSummary } from './forest.js';
export { funnelFigure, FUNNEL_MAX_POINTS, type FunnelInput } from './funnel.js';
export { bubbleFigure, type BubbleInput } from './bubble.js';
export { proportionsFigure, fittedProbability, type ProportionCell, type ProportionInput } from './psychometric.js';
export { PLOT_COLORS } from './theme.js';
