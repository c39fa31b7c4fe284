import type { Caution, PlotFigure } from '../../../../shared/synthesis/types';

export interface Counts {
  effects: number;
  studies: number;
  references: number;
}

export interface PooledCell {
  outcome: string;
  outcomeLabel: string;
  manipulation: string;
  manipulationLabel: string;
  metric: string;
  metricLabel: string;
  filters: Record<string, string>;
  counts: Counts;
  pooled: {
    estimate: number;
    ci_lower: number;
    ci_upper: number;
    pi_lower: number | null;
    pi_upper: number | null;
    tau2: number | null;
    I2: number | null;
    Q_p: number | null;
    p: number;
    level: number;
    method: string;
  };
  cautions: Caution[];
  forest?: PlotFigure;
}
