// The one place the synthesis pipeline reaches into the statistics engine (shared/stats).
export { pool, leaveOneOut, cumulative, trimFill, metaRegression, begg, subgroups, aggregateWithinStudy, normalTwoTailed, tTwoTailed, poolMultilevel, robustPool, poolMultilevelWithRobust, StatsInputError } from '../stats/index.js';
export type { PoolResult, Method, SensitivityEntry, MultilevelResult, RobustResult } from '../stats/index.js';
