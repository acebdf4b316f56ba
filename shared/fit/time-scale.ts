import type { CompiledFitModel } from './compile';
import type { FitProblem } from './problem';
import type { Transitions } from './transitions';

/**
 * Whether the observation intervals are long against the model's own time scale: 1/‖J‖ with J
 * the drift's Jacobian (by finite differences) at the average observed state and the estimates.
 * For Ornstein–Uhlenbeck the Euler pseudo-likelihood estimates (1 − e^{−κΔ})/Δ instead of κ, a
 * relative bias of about κΔ/2; past κΔ ≈ 0.1 that bias (5 %) is worth a warning.
 */
const LONG_INTERVAL_RATIO = 0.1;

function driftRate(model: CompiledFitModel, transitions: Transitions, theta: Float64Array): number {
  const { d, m } = model;
  const pv = new Float64Array(model.parameterCount);
  model.parameters(theta, pv);
  const centre = new Float64Array(d);
  for (let k = 0; k < transitions.count; k++)
    for (let i = 0; i < d; i++) centre[i] = centre[i]! + transitions.x0[k * d + i]! / transitions.count;
  const t = transitions.count > 0 ? transitions.t0[0]! : 0;
  const f0 = new Float64Array(d);
  const f1 = new Float64Array(d);
  const g = new Float64Array(d * m);
  model.coefficients(pv, t, centre, f0, g);
  const rowSums = new Float64Array(d);
  for (let j = 0; j < d; j++) {
    const h = 1e-6 * Math.max(Math.abs(centre[j]!), 1);
    const shifted = Float64Array.from(centre);
    shifted[j] = shifted[j]! + h;
    model.coefficients(pv, t, shifted, f1, g);
    for (let i = 0; i < d; i++) rowSums[i] = rowSums[i]! + Math.abs((f1[i]! - f0[i]!) / h);
  }
  return Math.max(...rowSums);
}

export function timeScaleWarnings(
  problem: FitProblem,
  model: CompiledFitModel,
  transitions: Transitions,
  theta: Float64Array,
  interval: number,
): string[] {
  if (problem.method === 'exact') return [];
  const rate = driftRate(model, transitions, theta);
  if (!Number.isFinite(rate) || rate <= 0) return [];
  const scale = 1 / rate;
  const step = problem.method === 'simulated' ? interval / problem.simulated.subSteps : interval;
  if (step * rate <= LONG_INTERVAL_RATIO) return [];
  const fmt = (x: number) => x.toPrecision(2);
  if (problem.method === 'euler')
    return [
      `the observations are ${fmt(interval)} time units apart (median), long against the model's time scale of about ${fmt(scale)}: the Euler pseudo-likelihood is biased here (rates come out too small); use the simulated likelihood${problem.exactForm ? ' or the exact likelihood' : ''}`,
    ];
  return [
    `each sub-step (${fmt(step)}) is still long against the model's time scale of about ${fmt(scale)}: raise the sub-steps so that the bias of each step stays small`,
  ];
}
