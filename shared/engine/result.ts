import type { Method } from '../sheet/document';
import type { WatchSpec } from './plan';
import type { KernelName } from './wasm/kernel-choice';

/**
 * Output types of the engine. A `ChunkResult` is what one worker returns for a contiguous range
 * of paths: typed arrays plus a few numbers, so every buffer can be transferred.
 *
 * Layouts (all "column-major by path", so one column is one contiguous run of paths):
 *   saved          index (k · d + i) · pathCount + p   k = saved-time index, i = state, p = path
 *   probeValues    index (j · d + i) · pathCount + p   j = probe-time index
 *   runningMax/Min index i · pathCount + p
 *   firstPassage   index w · pathCount + p            w = watch index; NaN = not reached
 *   absorptionTime index i · pathCount + p            NaN = state i never absorbed
 *   blowupTime     index p                            time the path was lost; NaN = not lost
 *   lossCause      index p                            LOSS_CAUSE_CODES (0 = not lost)
 * A lost path holds NaN at every saved and probe time after the loss; its running max/min cover
 * the steps before it. ("blowupTime" keeps its old name: it records every loss, whatever the cause.)
 */

/**
 * Why a path was lost, as stored per path in `lossCause`:
 *   domain    a state became not a number: a coefficient was evaluated outside its domain (square
 *             root or logarithm of a negative number, 0/0, ∞ − ∞ after an overflow in one step)
 *   infinite  a state became ±∞ (overflow, or a division by zero)
 *   bound     a state left [−bound, bound] (the simulation's blow-up bound)
 */
export const LOSS_CAUSE_CODES = { none: 0, domain: 1, infinite: 2, bound: 3 } as const;
export type LossCause = Exclude<keyof typeof LOSS_CAUSE_CODES, 'none'>;
export interface ChunkResult {
  firstPath: number;
  /** Paths this chunk was asked for. */
  pathCount: number;
  /** Paths actually simulated (fewer than pathCount only when cancelled); always a prefix. */
  pathsDone: number;
  cancelled: boolean;
  stateCount: number;
  saveCount: number;
  probeCount: number;
  watchCount: number;
  saved: Float64Array;
  probeValues: Float64Array;
  runningMax: Float64Array;
  runningMin: Float64Array;
  firstPassage: Float64Array;
  absorptionTime: Float64Array;
  blowupTime: Float64Array;
  lossCause: Uint8Array;
  /** The kernel that simulated the chunk (both give the same bits; see shared/engine/wasm). */
  kernel: KernelName;
  /** Why the wasm kernel was not used, when it was asked for or chosen automatically. */
  kernelNote?: string;
}

export interface SimulationHooks {
  /** Called with the number of paths of this chunk done so far, at most every ~20 ms of work. */
  onProgress?(pathsDone: number): void;
  /** Polled between small batches of paths (every ~20 ms of work); true stops the chunk. */
  shouldStop?(): boolean;
}

/** Statistics over live paths at every saved time, for one state variable (arrays of saveCount). */
export interface SavedStats {
  mean: Float64Array;
  /** Unbiased sample variance (divisor n − 1); NaN with fewer than two live paths. */
  variance: Float64Array;
  /** Quantiles by Hyndman & Fan (1996) type 7 (linear interpolation between order statistics). */
  q05: Float64Array;
  q25: Float64Array;
  q50: Float64Array;
  q75: Float64Array;
  q95: Float64Array;
  min: Float64Array;
  max: Float64Array;
  /** Paths with a finite value (not blown up) at that time. */
  live: Int32Array;
}

/**
 * Paths the engine could not carry to t1, by cause. Beyond LOSS_SHARE_LIMIT of the paths, every
 * estimate of the run describes only the surviving paths (a conditional law that can be far from
 * the model's: survivors are those that stayed where the coefficients are defined), and says so.
 */
export interface LossSummary {
  count: number;
  paths: number;
  /** count / paths (0 for a run with no paths). */
  share: number;
  byCause: Record<LossCause, number>;
  /** Earliest loss time over all paths, or null. */
  firstTime: number | null;
  /** More than LOSS_SHARE_LIMIT lost: every estimate is conditional on the surviving paths. */
  conditional: boolean;
  /** Every path lost: the run has no estimates. */
  allLost: boolean;
  /** The losses in words, or null when nothing was lost. */
  message: string | null;
  /** What to change, by cause (empty when nothing was lost). */
  advice: string[];
}

/** Kept for the page until it reads `losses`: count and first time of every loss, whatever the cause. */
export interface BlowupSummary {
  count: number;
  /** Earliest blow-up time over all paths, or null. */
  firstTime: number | null;
  /** Advice shown next to the result, or null when nothing blew up. */
  suggestion: string | null;
}

export interface ExtinctionSummary {
  state: number;
  /** Paths absorbed at this state's boundary by t1. */
  count: number;
  firstTime: number | null;
  /** Mean absorption time among absorbed paths, or null. */
  meanTime: number | null;
}

export interface StabilityReport {
  /**
   * 'mean-square': scalar model dX = λX dt + μX dW, the scheme's exact mean-square factor E[R²]
   * (Higham 2000). 'linear-drift': the drift's Jacobian at the initial state and at the mean state
   * of each saved time; the step is unstable where |R(hλ)| > 1 for an eigenvalue λ (R(z) = 1 + z
   * for Euler–Maruyama and Milstein, 1 + z + z²/2 for Heun), which is the whole mean-square
   * condition for additive noise and a necessary one otherwise.
   */
  check: 'mean-square' | 'linear-drift';
  scheme: Method;
  /** Drift = lambda · x (mean-square), or the real part of the eigenvalue that decides (linear-drift). */
  lambda: number;
  /** Imaginary part of that eigenvalue (0 for the mean-square check). */
  lambdaImag: number;
  /** Diffusion = mu · x (mean-square check), else null. */
  mu: number | null;
  h: number;
  /** Time of the state where the check is worst (t0 for the initial state). */
  time: number;
  stable: boolean;
  /** The model's own second moment (mean-square) or linearised drift (linear-drift) decays; when it does not, no step is stable and no step is to blame. */
  modelStable: boolean;
  /** E[R²] (mean-square) or the largest |R(hλ)| (linear-drift); stable iff < 1 (≤ 1 for linear-drift). */
  amplification: number;
  /** Largest step that would be stable at the worst state, or null when none would (or no bound applies). */
  maxStableStep: number | null;
  message: string;
}

export interface ProbeSeries {
  /** The step time the requested probe time was snapped to. */
  time: number;
  requested: number;
  /** One Float64Array of length `paths` per state (NaN for blown-up paths). */
  values: Float64Array[];
}

export interface SimulationResult {
  stateNames: string[];
  method: Method;
  /** Paths merged (simulated and not cancelled), including blown-up ones. */
  paths: number;
  cancelled: boolean;
  steps: number;
  h: number;
  t0: number;
  t1: number;
  seed: number;
  /** Actual saved times (step times nearest the even grid). */
  savedTimes: Float64Array;
  /** Step index of each saved time. */
  savedSteps: Int32Array;
  /** Per state. */
  stats: SavedStats[];
  /**
   * All path values at all saved times, per state: index k · paths + p. Kept so charts and
   * probes can read the distribution at any saved time.
   */
  savedValues: Float64Array[];
  /**
   * Covariance matrix of the states at each saved time, index (k · d + i) · d + j (unbiased, over
   * live paths; the diagonal is stats[i].variance), or null for a model with one state.
   */
  covariance: Float64Array | null;
  /** Per state, per sample path: that path's values at the saved times. */
  samplePaths: Float64Array[][];
  /** Per state: every path's value at t1 (NaN for blown-up paths). */
  finalValues: Float64Array[];
  probes: ProbeSeries[];
  /** Per state, per path. */
  runningMax: Float64Array[];
  runningMin: Float64Array[];
  watches: WatchSpec[];
  /** Per watch: the level the run compared against (the watch's own, or continuity-corrected). */
  watchLevels: Float64Array;
  /** Per watch, per path: first time the level was reached (NaN = not reached). */
  firstPassage: Float64Array[];
  /** Per state, per path: absorption time (NaN = not absorbed). */
  absorptionTime: Float64Array[];
  /** Per path: time the path was lost (NaN = not lost). */
  blowupTime: Float64Array;
  /** Per path: LOSS_CAUSE_CODES. */
  lossCause: Uint8Array;
  losses: LossSummary;
  /** @deprecated the same losses in the older shape; read `losses`. */
  blowups: BlowupSummary;
  extinctions: ExtinctionSummary[];
  stability: StabilityReport | null;
  /** FNV-1a 64 over every number the run reports (hex, 16 digits; see run-digest.ts for the order). */
  digest: string;
  /** The kernel that ran (the wasm one where any chunk ran on it); the numbers are the same. */
  kernel: KernelName;
  /** Why the wasm kernel was not used, when it was not. */
  kernelNote?: string;
}

export interface ProbeRequest {
  quantity:
    | 'mean'
    | 'variance'
    | 'quantile'
    | 'exceedance'
    | 'subceedance'
    | 'hit-before'
    | 'first-passage'
    | 'extinction'
    | 'covariance'
    | 'correlation';
  state: number;
  /** The second state of a covariance or correlation. */
  stateY?: number;
  /** Default t1. */
  time?: number;
  level?: number;
  probability?: number;
  /** Default 'above'. */
  direction?: 'above' | 'below';
  /** hit-before and first-passage: steps only ('discrete', default) or continuity-corrected ('bgk'). */
  monitoring?: 'discrete' | 'bgk';
}

export interface ProbeEstimate {
  estimate: number;
  standardError: number;
  /** 95 % interval. */
  ci: [number, number];
  /** Paths the estimate rests on (for first-passage: how many reached the level). */
  paths: number;
  note?: string;
  /**
   * What a reader must know before using the estimate: conditional on surviving paths, an
   * unstable step. Absent or empty when there is nothing to say.
   */
  warnings?: string[];
  /** hit-before and first-passage: how the path was watched between steps, in words. */
  monitoring?: string;
}

export interface StudyOptions {
  levels: number;
  coarsestSteps: number;
  paths: number;
  /** State index to measure. */
  state: number;
  reference: 'auto' | 'exact' | 'finest';
}

export interface StudyLevel {
  steps: number;
  h: number;
  strongError: number;
  strongSE: number;
  weakError: number;
  weakSE: number;
}

export interface StudyResult {
  levels: StudyLevel[];
  /** Fitted slope of log error against log h; NaN when it cannot be fitted. */
  strongOrder: number;
  strongOrderSE: number;
  strongOrderCI: [number, number];
  weakOrder: number;
  weakOrderSE: number;
  weakOrderCI: [number, number];
  reference: 'exact' | 'finest';
  /** Samples used (paths that blew up at some level are left out). */
  paths: number;
  excluded: number;
  note?: string;
}
