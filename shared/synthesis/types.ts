import type { Metric } from '../stats/metrics.js';
import type { PoolResult } from '../stats/types.js';
import type { Dependence, Moderator, RegressionModerator, SubgroupTau2Model, SubgroupVariable, SynthesisFilters, SynthesisRequest } from '../schemas/synthesis.js';
import type { Method } from '../stats/types.js';

/** One settled effect as the registry stores it (server/repositories/effects.ts querySettledEffects). */
export interface SettledEffect {
  id: number;
  referenceId: number;
  studyId: number;
  studyLabel: string;
  referenceLabel: string;
  year: number | null;
  outcome: string;
  /** what was measured and its unit (shared/vocabulary/parameters.ts); null only for effects coded before both were recorded */
  parameter?: string | null;
  unit?: string | null;
  /** computed from a reported bound (p < …) / from a median with quartiles or range */
  fromBound?: boolean;
  approximate?: boolean;
  manipulation: string;
  /** the vocabulary label of the manipulation, when the repository gives it */
  manipulationLabel?: string;
  metric: Metric | string;
  effect: number;
  variance: number;
  n: number | null;
  design: string | null;
  population: string | null;
  modality: string | null;
  task: string | null;
  standardMs: number | null;
}

/** One pooled unit: a study after its effects were combined (or one kept) by the dependence rule. */
export interface PooledRow {
  studyId: number;
  referenceId: number;
  label: string;
  effect: number;
  variance: number;
  year: number | null;
  n: number | null;
  /** ids of the settled effects this unit stands for */
  effectIds: number[];
  /** the subgroup this unit belongs to, when a subgroup variable was chosen */
  subgroup?: string;
  /** moderator value, when a moderator was chosen (mean over the study's effects) */
  moderator?: number | null;
  /** percent weight in the overall pooled estimate */
  weight: number;
  /** three-level model: the paper's own label (rows are effects, grouped under their paper) */
  paper?: string;
}

export interface SensitivityRow {
  label: string;
  studyId: number;
  year: number | null;
  k: number;
  estimate: number;
  ci_lower: number;
  ci_upper: number;
  p: number;
  tau2: number | null;
  /** I² from Q */
  I2: number | null;
  /** I² from τ² and the typical within-study variance (REML and PM; null otherwise) */
  I2_tau?: number | null;
}

export interface SubgroupResult {
  value: string;
  label: string;
  k: number;
  estimate: number;
  se: number;
  ci_lower: number;
  ci_upper: number;
  tau2: number | null;
  I2: number | null;
  I2_tau?: number | null;
  p: number;
}

export interface SubgroupComparison {
  variable: SubgroupVariable;
  groups: SubgroupResult[];
  /** a separate τ² per subgroup, or one shared τ² (absent in older snapshots: separate) */
  tau2Model?: SubgroupTau2Model;
  /** the shared τ² (pooled model, random effects) */
  tau2_pooled?: number | null;
  /** the between-subgroups statistic: Q (χ²) or, for one shared τ² under HKSJ, the F of the factor */
  Q_between: number | null;
  df: number | null;
  df2?: number | null;
  test?: 'chisq' | 'F' | null;
  p: number | null;
}

export interface BeggResult {
  tau: number;
  z: number;
  p: number;
  /** exact Kendall distribution (k ≤ 50 without ties) or the normal approximation (absent in older snapshots) */
  p_method?: 'exact' | 'normal';
}

export interface TrimFillResult {
  side: 'left' | 'right';
  k0: number;
  estimate: number;
  ci_lower: number;
  ci_upper: number;
  /** imputed (mirrored) studies */
  imputed: Array<{ effect: number; variance: number }>;
}

export interface MetaRegressionResult {
  moderator: Moderator;
  k: number;
  intercept: number;
  slope: number;
  slope_se: number;
  slope_ci_lower: number;
  slope_ci_upper: number;
  slope_p: number;
  /** t df under Knapp–Hartung, null for z (absent in older snapshots) */
  slope_df?: number | null;
  tau2: number | null;
  R2: number | null;
  /** units left out because their moderator value is missing */
  missing: number;
}

/** One coefficient of the several-moderator meta-regression, named in words. */
export interface RegressionTerm {
  /** "Intercept", a moderator's label, or "Moderator: level" for a dummy of a category */
  label: string;
  moderator: RegressionModerator | null;
  /** the category level this dummy stands for (its code), else null */
  level: string | null;
  estimate: number;
  se: number;
  statistic: number;
  /** t df under Knapp–Hartung, null for z */
  df: number | null;
  p: number;
  ci_lower: number;
  ci_upper: number;
}

/** The meta-regression on several moderators at once (mixed-effects model; Knapp–Hartung when hksj). */
export interface SeveralModeratorsResult {
  moderators: Array<{ moderator: RegressionModerator; label: string; type: 'continuous' | 'categorical'; reference: string | null; referenceLabel: string | null }>;
  k: number;
  /** units left out because a moderator value is missing */
  missing: number;
  method: Method;
  hksj: boolean;
  terms: RegressionTerm[];
  tau2: number | null;
  tau2_total: number | null;
  R2: number | null;
  /** test of all moderator coefficients: χ² on QM_df, or the F on (QM_df, QM_df2) under Knapp–Hartung */
  QM: number;
  QM_df: number;
  QM_df2: number | null;
  QM_test: 'chisq' | 'F';
  QM_p: number;
  QE: number;
  QE_df: number;
  QE_p: number;
  /** fewer than 10 studies per moderator coefficient */
  fewPerCovariate: boolean;
}

/** τ² and I² by each estimator, each I² from that estimator's own τ² (as metafor reports it). */
export interface EstimatorRow {
  method: Method;
  label: string;
  estimate: number;
  ci_lower: number;
  ci_upper: number;
  tau2: number | null;
  tau2_ci_lower: number | null;
  tau2_ci_upper: number | null;
  I2: number | null;
  H2: number | null;
}

/** The three-level fit behind a multilevel synthesis (effects within papers). */
export interface MultilevelSummary {
  /** papers (clusters) */
  clusters: number;
  sigma2_between: number;
  sigma2_within: number;
  /** percent (Cheung 2014) */
  I2_between: number;
  I2_within: number;
  loglik: number;
  /** whether the pooled test and interval use the CR2 robust variance */
  robust: boolean;
  /** model-based (REML) inference for the pooled estimate */
  model: { estimate: number; se: number; ci_lower: number; ci_upper: number; statistic: number; statistic_df: number | null; p: number };
  /** CR2 with Satterthwaite df; null when not asked for or not possible (then `robustUnavailable` says why) */
  robustTest: { se: number; df: number; t: number; p: number; ci_lower: number; ci_upper: number } | null;
  robustUnavailable?: string;
}

/** The aggregate mode's pooled estimate at each assumed correlation. */
export interface CorrelationSensitivityRow {
  r: number;
  k: number;
  estimate: number;
  se: number;
  ci_lower: number;
  ci_upper: number;
  p: number;
  tau2: number | null;
  I2: number | null;
  I2_tau?: number | null;
}

export interface Caution {
  code: 'few_studies_dl' | 'few_clusters' | 'few_studies_tests' | 'high_heterogeneity' | 'not_clinical' | 'single_study' | 'analysis_unavailable' | 'few_per_covariate';
  text: string;
}

export interface PlotFigure {
  data: Array<Record<string, unknown>>;
  layout: Record<string, unknown>;
  /** the same figure laid out for a phone-width box, drawn there instead (forest plots) */
  narrow?: PlotFigure;
}

export interface SynthesisFigures {
  forest: PlotFigure;
  funnel: PlotFigure | null;
  bubble: PlotFigure | null;
}

/** What a synthesis answers (and a snapshot freezes). */
export interface SynthesisOutput {
  request: SynthesisRequest;
  metric: Metric | string;
  counts: { effects: number; studies: number; references: number };
  dependence: Dependence;
  rows: PooledRow[];
  result: PoolResult;
  subgroups: SubgroupComparison | null;
  leaveOneOut: SensitivityRow[] | null;
  cumulative: SensitivityRow[] | null;
  begg: BeggResult | null;
  trimFill: TrimFillResult | null;
  metaRegression: MetaRegressionResult | null;
  /** the meta-regression on several moderators, when asked for (absent in older snapshots) */
  regression?: SeveralModeratorsResult | null;
  /** τ² and I² by every estimator over the same studies (absent in older snapshots and under the three-level model) */
  estimators?: EstimatorRow[] | null;
  cautions: Caution[];
  figures: SynthesisFigures;
  /** dependence mode "multilevel": the three-level fit (absent in older snapshots) */
  multilevel?: MultilevelSummary | null;
  /** dependence mode "aggregate": the pooled estimate over r = 0 … 0.9 (absent in older snapshots) */
  correlationSensitivity?: CorrelationSensitivityRow[] | null;
  /** how many papers contribute more than one effect (the three-level model is recommended when any do) */
  papersWithSeveralEffects?: number;
  /** analyses the engine could not run here, with the reason */
  unavailable: Array<{ analysis: string; reason: string }>;
  /** set when an answer carries only the first page of `rows` (and of `result.weights`): how many there are */
  rowsTotal?: number;
}

export type { SynthesisFilters, SynthesisRequest };
