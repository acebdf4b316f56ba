import type { SimulationPlan } from './plan';
import { choleskyOfCorrelation } from './cholesky';
import { MAX_PATHS, MAX_STEPS } from './limits';
import { monitoredLevel } from './monitoring';

/**
 * Everything the kernel and the merge derive from a plan, checked once: sizes, the step, the
 * step indices of saved and probe times, the Cholesky factor of the noise correlation.
 */
export interface PlanLayout {
  stateCount: number;
  noiseCount: number;
  h: number;
  /** Step index of each saved time (non-decreasing), followed by a sentinel −1. */
  saveSteps: Int32Array;
  savedTimes: Float64Array;
  /** Step index of each probe time in the plan's order. */
  probeSteps: Int32Array;
  probeTimes: Float64Array;
  /** Probe indices sorted by step, followed by a sentinel −1 (the kernel walks them in time order). */
  probeOrder: Int32Array;
  /** Per watch, the level the kernel compares against (shifted by a continuity correction). */
  watchLevels: Float64Array;
  /** Lower-triangular m × m factor (row-major), or null for independent noise. */
  cholesky: Float64Array | null;
}

/** Path values a merged run may hold (8 bytes each, so about 2 GB); beyond this the merge cannot allocate. */
export const MAX_SAVED_VALUES = 2 ** 28;

export function stepTime(plan: SimulationPlan, h: number, step: number): number {
  return step === plan.steps ? plan.t1 : plan.t0 + step * h;
}

export function planLayout(plan: SimulationPlan): PlanLayout {
  const { model } = plan;
  const stateCount = model.stateNames.length;
  const noiseCount = model.noiseNames.length;
  if (stateCount < 1) throw new RangeError('a model needs at least one state variable');
  if (model.drift.length !== stateCount)
    throw new RangeError(`expected ${stateCount} drift expressions, got ${model.drift.length}`);
  if (model.initial.length !== stateCount)
    throw new RangeError(`expected ${stateCount} initial values, got ${model.initial.length}`);
  if (model.diffusion.length !== stateCount || model.diffusion.some((row) => row.length !== noiseCount)) {
    throw new RangeError(
      `the diffusion must have ${stateCount} rows of ${noiseCount} entries (one per noise source)`,
    );
  }
  model.initial.forEach((value, i) => {
    if (!Number.isFinite(value))
      throw new RangeError(`the initial value of ${model.stateNames[i]} is not a finite number (${value})`);
  });
  if (!Number.isFinite(plan.t0) || !Number.isFinite(plan.t1) || !(plan.t1 > plan.t0)) {
    throw new RangeError(`the end time must be after the start time (got ${plan.t0} to ${plan.t1})`);
  }
  if (!Number.isInteger(plan.steps) || plan.steps < 1)
    throw new RangeError(`steps must be a positive integer, got ${plan.steps}`);
  if (plan.steps > MAX_STEPS)
    throw new RangeError(
      `a run takes at most ${MAX_STEPS.toLocaleString('en')} steps, this one ${plan.steps.toLocaleString('en')}; use a larger step size`,
    );
  if (!Number.isInteger(plan.paths) || plan.paths < 1)
    throw new RangeError(`paths must be a positive integer, got ${plan.paths}`);
  if (plan.paths > MAX_PATHS)
    throw new RangeError(
      `a run takes at most ${MAX_PATHS.toLocaleString('en')} paths, this one ${plan.paths.toLocaleString('en')}`,
    );
  if (!Number.isInteger(plan.seed) || plan.seed < 0 || plan.seed > 0xffffffff)
    throw new RangeError(`the seed must be an integer from 0 to 4294967295, got ${plan.seed}`);
  if (!Number.isInteger(plan.saveCount) || plan.saveCount < 2)
    throw new RangeError(`saveCount must be an integer of at least 2, got ${plan.saveCount}`);
  if (!Number.isInteger(plan.samplePaths) || plan.samplePaths < 0)
    throw new RangeError(`samplePaths must be a non-negative integer, got ${plan.samplePaths}`);
  if (plan.boundaries.length !== stateCount)
    throw new RangeError(
      `expected one boundary rule per state variable (${stateCount}), got ${plan.boundaries.length}`,
    );
  if (plan.blowupBound !== null && !(plan.blowupBound > 0))
    throw new RangeError(`the blow-up bound must be positive, got ${plan.blowupBound}`);
  const savedValues = plan.paths * (plan.saveCount + plan.probeTimes.length) * stateCount;
  if (savedValues > MAX_SAVED_VALUES) {
    throw new RangeError(
      `the run would keep ${savedValues.toExponential(2)} path values (paths × (saved + probe times) × states), more than ${MAX_SAVED_VALUES.toExponential(2)}; lower the number of paths or saved times`,
    );
  }
  for (const watch of plan.watches) {
    if (!Number.isInteger(watch.state) || watch.state < 0 || watch.state >= stateCount)
      throw new RangeError(`a watch names state ${watch.state}, which does not exist`);
    if (!Number.isFinite(watch.level)) throw new RangeError('a watched level must be a finite number');
  }

  const h = (plan.t1 - plan.t0) / plan.steps;
  const saveSteps = new Int32Array(plan.saveCount + 1);
  const savedTimes = new Float64Array(plan.saveCount);
  for (let k = 0; k < plan.saveCount; k++) {
    // Nearest step to the even grid time t0 + k·(t1 − t0)/(saveCount − 1).
    const step = Math.round((k * plan.steps) / (plan.saveCount - 1));
    saveSteps[k] = step;
    savedTimes[k] = stepTime(plan, h, step);
  }
  saveSteps[plan.saveCount] = -1;

  const probeCount = plan.probeTimes.length;
  const probeSteps = new Int32Array(probeCount);
  const probeTimes = new Float64Array(probeCount);
  plan.probeTimes.forEach((time, j) => {
    const tolerance = 1e-9 * (plan.t1 - plan.t0);
    if (!Number.isFinite(time) || time < plan.t0 - tolerance || time > plan.t1 + tolerance) {
      throw new RangeError(`a probe time must lie between ${plan.t0} and ${plan.t1}, got ${time}`);
    }
    const step = Math.min(plan.steps, Math.max(0, Math.round((time - plan.t0) / h)));
    probeSteps[j] = step;
    probeTimes[j] = stepTime(plan, h, step);
  });
  const sorted = Array.from(probeSteps.keys()).sort((a, b) => probeSteps[a]! - probeSteps[b]! || a - b);
  const probeOrder = new Int32Array(probeCount + 1);
  sorted.forEach((j, q) => (probeOrder[q] = j));
  probeOrder[probeCount] = -1;

  const cholesky =
    model.correlation === null || noiseCount === 0
      ? null
      : choleskyOfCorrelation(model.correlation, noiseCount);
  const watchLevels = Float64Array.from(plan.watches, (watch) => monitoredLevel(plan, watch, h));
  return {
    stateCount,
    noiseCount,
    h,
    saveSteps,
    savedTimes,
    probeSteps,
    probeTimes,
    probeOrder,
    watchLevels,
    cholesky,
  };
}
