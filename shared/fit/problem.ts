/**
 * A fit as plain data: what the fit cell hands to the executor (a worker in the browser), and
 * what comes back. Expression sources come only from the expression compiler's checked trees
 * (see build-problem.ts); parameters appear in them as `p0…`, states as `s0…`, time as `t`.
 */

export const FIT_METHODS = ['exact', 'euler', 'simulated'] as const;
export type FitMethod = (typeof FIT_METHODS)[number];

/** The model forms whose transition density is known in closed form. */
export type ExactForm = 'linear' | 'gbm';

export interface FitParameter {
  name: string;
  unit: string;
  start: number;
  /** Bounds from the params cell (null: none on that side). */
  lower: number | null;
  upper: number | null;
}

export interface FitModelCode {
  stateNames: string[];
  noiseCount: number;
  /** How many parameters the model's program computes (p0 … p{n-1}). */
  parameterCount: number;
  /**
   * Statements computing p0 … p{n-1} from `theta` (the estimated values, in FitParameter order):
   * an estimated parameter reads theta[i], a fixed one is a literal, a derived one is generated
   * from its checked expression.
   */
  parameterBody: string;
  /** d drift sources and d × m diffusion sources over p*, s*, t. */
  drift: string[];
  diffusion: string[][];
  /** m × m correlation of the noise sources, or null for independent sources. */
  correlation: number[][] | null;
}

/** One independent series with every state observed at each kept time (rows with a gap dropped). */
export interface FitSeries {
  group: string | null;
  times: number[];
  /** values[k][i]: state i at times[k]. */
  values: number[][];
}

export interface FitProblem {
  method: FitMethod;
  /** The closed form recognised in the model (shared/fit/recognise.ts), or null. */
  exactForm: ExactForm | null;
  model: FitModelCode;
  parameters: FitParameter[];
  series: FitSeries[];
  /** Observations dropped because a state was missing there. */
  droppedRows: number;
  /** Optimiser starts: the params cell's values first, then spread-out starts. */
  starts: number;
  simulated: { subSteps: number; draws: number; seed: number };
}

export interface FitEstimate {
  name: string;
  unit: string;
  estimate: number;
  /** Null when the observed information could not be inverted at the estimate. */
  standardError: number | null;
  ci: [number | null, number | null];
  /** The estimate sits on (or against) a bound: its interval means little. */
  atBound: boolean;
}

export interface FitResult {
  method: FitMethod;
  ok: boolean;
  estimates: FitEstimate[];
  logLikelihood: number;
  aic: number;
  observations: number;
  transitions: number;
  groups: number;
  evaluations: number;
  converged: boolean;
  /** Convergence in plain words ("converged: a fresh search from the best point found nothing better"). */
  convergence: string;
  /** What to do when the fit failed or did not converge. */
  advice: string[];
  /** What a reader must know before using the numbers. */
  warnings: string[];
  /** Standardised one-step residuals against N(0, 1). */
  residuals: {
    count: number;
    ksStatistic: number | null;
    ksPValue: number | null;
    /** How the residuals were computed, in words. */
    basis: string;
    /** Up to 200 (theoretical, sample) quantile pairs for a QQ plot. */
    qq: [number, number][];
  };
  /** Starts that reached a clearly lower maximum than the best. */
  startsBelowBest: number;
  seconds: number;
}
