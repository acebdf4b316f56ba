import type { ModelSpec, SimulationPlan } from './plan';

/**
 * A rough estimate of a run's work, shown before it starts so nobody launches a day-long job by a
 * typo. The rate is a ballpark for Euler–Maruyama on a small model on one core of a laptop (the
 * `ou-scalar` bench case runs faster; models with several states and noise sources run slower),
 * not a promise.
 */
export const NOMINAL_STATE_STEPS_PER_SECOND = 4e7;
/** Beyond this much work on one core, a run is "far beyond minutes" and the estimate is shown. */
export const MINUTES_OF_WORK = 10 * 60;

export interface WorkEstimate {
  /** paths × steps. */
  pathSteps: number;
  /** Seconds on one core at the nominal rate. */
  seconds: number;
  beyondMinutes: boolean;
  /** Set when beyondMinutes: the estimate in words. */
  message: string | null;
}

function duration(seconds: number): string {
  if (seconds < 5400) return `${Math.round(seconds / 60)} minutes`;
  if (seconds < 2 * 86400) return `${(seconds / 3600).toFixed(1)} hours`;
  return `${Math.round(seconds / 86400)} days`;
}

export function estimateWork(
  plan: Pick<SimulationPlan, 'paths' | 'steps'> & { model: Pick<ModelSpec, 'stateNames'> },
): WorkEstimate {
  const pathSteps = plan.paths * plan.steps;
  const states = Math.max(1, plan.model.stateNames.length);
  const seconds = (pathSteps * states) / NOMINAL_STATE_STEPS_PER_SECOND;
  const beyondMinutes = seconds > MINUTES_OF_WORK;
  const message = beyondMinutes
    ? `this run is ${pathSteps.toExponential(2)} path-steps, roughly ${duration(seconds)} on one core (at about ${NOMINAL_STATE_STEPS_PER_SECOND.toExponential(0)} state-steps per second); lower the paths or the steps, or spread it over more cores`
    : null;
  return { pathSteps, seconds, beyondMinutes, message };
}
