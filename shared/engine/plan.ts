import type { BoundaryRule, Method } from '../sheet/document';

/**
 * The contract between the sheet (checked and compiled by shared/sheet + shared/expr) and the
 * engine (shared/engine). A plan is plain data (strings and numbers), so it can be posted to a
 * worker as it is. The engine turns the expression sources into one stepping function per run.
 *
 * Identifiers the expression sources may use, and nothing else:
 *   t          current time
 *   s0..s{d-1} state variables, in `stateNames` order
 *   w0..w{m-1} Brownian motion W_t of each noise source (only in `exact` sources)
 *   the helper names defined by EXPRESSION_PRELUDE in shared/expr (math functions)
 * Parameters are already folded in as numeric literals (except in `inputForm`, where some are
 *   pv0..pv{k-1}, read by the kernel per run).
 */
export interface ModelSpec {
  stateNames: string[];
  noiseNames: string[];
  /** Units of the state variables ('' where none), for axis titles. */
  stateUnits: string[];
  /** Initial values, evaluated from their expressions. */
  initial: number[];
  /** Resolved parameter values (overrides applied), for display and the record of a run. */
  params: Record<string, number>;
  calculus: 'ito' | 'stratonovich';
  /** d JavaScript expression sources. */
  drift: string[];
  /** d × m JavaScript expression sources ('0' where a state does not feel a noise source). */
  diffusion: string[][];
  /** m × m correlation matrix of the noise sources, or null for independent sources. */
  correlation: number[][] | null;
  /** Exact solution per state, in terms of t, w0..w{m-1} and s0..s{d-1} standing for initial values. */
  exact: (string | null)[];
  /**
   * Present only when a run of many points (a sweep, scenarios) varies parameters: the same
   * coefficients with those parameters left as kernel inputs (`pv0`, `pv1` … in `names` order)
   * instead of literals, so one compiled kernel serves every point. The kernel then reads the
   * parameter values (from `params`), the initial values and the watched levels per run. Absent
   * for a single run: the plain literal path. A backend that cannot read inputs falls back to
   * the JavaScript kernel when it is present.
   */
  inputForm?: InputForm;
}

/** Drift and diffusion sources with some parameters as kernel inputs (see ModelSpec.inputForm). */
export interface InputForm {
  /** Parameter names read from the kernel's inputs; the k-th is `pv{k}` in the sources. */
  names: string[];
  /** d sources. */
  drift: string[];
  /** d × m sources. */
  diffusion: string[][];
}

/** A level a probe watches on one state variable, so the engine records first passages. */
export interface WatchSpec {
  state: number;
  level: number;
  direction: 'above' | 'below';
  /**
   * How crossings between steps are accounted for: 'none' (default) compares the state at the
   * steps only; 'bgk' moves the compared level toward the start (see monitoring.ts).
   */
  correction?: 'none' | 'bgk';
}

export interface SimulationPlan {
  model: ModelSpec;
  method: Method;
  t0: number;
  t1: number;
  steps: number;
  paths: number;
  seed: number;
  /** Saved times: an even grid of saveCount points from t0 to t1; must divide `steps` evenly or be snapped. */
  saveCount: number;
  samplePaths: number;
  /** One rule per state variable, in `stateNames` order. */
  boundaries: BoundaryRule[];
  blowupBound: number | null;
  /**
   * Whether the kernel keeps every path's running maximum and minimum (a probe of hitting a level
   * with no watch reads them). Absent means true, as before the field existed; when false they are
   * NaN and the kernel skips that work.
   */
  recordExtremes?: boolean;
  /** Extra times at which all path values are kept (from probes), besides the saved grid. */
  probeTimes: number[];
  watches: WatchSpec[];
}
