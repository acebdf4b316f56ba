import { EXPRESSION_PRELUDE } from '../expr';
import type { SimulationPlan } from './plan';
import type { StabilityReport } from './result';
import { compileGenerated } from './compile-generated';
import { linearDriftStability } from './linear-stability';

/**
 * Mean-square stability of the chosen scheme with step h for a scalar linear model
 * dX = λX dt + μX dW. For such a model each step multiplies X by a random factor R, and the
 * second moment evolves by E[R²]; the scheme is mean-square stable iff E[R²] < 1.
 *   Euler–Maruyama: E[R²] = (1 + hλ)² + hμ² (Higham 2000, SIAM J. Numer. Anal. 38(3), θ = 0).
 *   Derivative-free Milstein (our form, Ῡ = X + λXh + μX√h): R = 1 + hλ + μ√h z + c(z² − 1),
 *     c = ½μ²h + ½μλh^{3/2}, so E[R²] = (1 + hλ)² + hμ² + 2c² (same computation).
 *   Stochastic Heun (Stratonovich): R = 1 + A + A²/2 with A = λh + μ√h z (same computation).
 */

const PROBE_STATES = [0.5, 1, 2, -1.5];
const RELATIVE_TOLERANCE = 1e-9;

type Scalar = (t: number, s0: number) => number;

function compileScalar(source: string): Scalar {
  // Built from the plan's checked sources (see plan.ts); evaluated a handful of times only.
  return compileGenerated<Scalar>(['t', 's0'], `"use strict"; ${EXPRESSION_PRELUDE} return (${source});`);
}

/** The slope c when f(t, x) = c·x at every probe point, else null. */
function linearSlope(f: Scalar, times: number[]): number | null {
  const slope = f(times[0]!, 1);
  if (!Number.isFinite(slope)) return null;
  for (const t of times) {
    if (Math.abs(f(t, 0)) > RELATIVE_TOLERANCE * Math.max(1, Math.abs(slope))) return null;
    for (const x of PROBE_STATES) {
      const value = f(t, x);
      if (!(Math.abs(value - slope * x) <= RELATIVE_TOLERANCE * Math.max(1, Math.abs(slope * x))))
        return null;
    }
  }
  return slope;
}

export function amplification(
  scheme: StabilityReport['scheme'],
  lambda: number,
  mu: number,
  h: number,
): number {
  if (scheme === 'euler-maruyama') return (1 + h * lambda) ** 2 + h * mu * mu;
  if (scheme === 'milstein') {
    const c = 0.5 * mu * mu * h + 0.5 * mu * lambda * h ** 1.5;
    return (1 + h * lambda) ** 2 + h * mu * mu + 2 * c * c;
  }
  const a = lambda * h;
  const c2 = mu * mu * h;
  return 1 + 2 * a + 2 * (a * a + c2) + (a ** 3 + 3 * a * c2) + (a ** 4 + 6 * a * a * c2 + 3 * c2 * c2) / 4;
}

const SCHEME_NAMES: Record<StabilityReport['scheme'], string> = {
  'euler-maruyama': 'Euler–Maruyama',
  milstein: 'Milstein',
  heun: 'Stochastic Heun',
};

export function meanSquareStability(plan: SimulationPlan): StabilityReport | null {
  const { model } = plan;
  if (model.stateNames.length !== 1 || model.noiseNames.length !== 1) return null;
  const times = [plan.t0, 0.5 * (plan.t0 + plan.t1), plan.t1];
  let lambda: number | null;
  let mu: number | null;
  try {
    lambda = linearSlope(compileScalar(model.drift[0]!), times);
    mu = linearSlope(compileScalar(model.diffusion[0]![0]!), times);
  } catch {
    return null;
  }
  // μ = 0 is additive (here: no) noise, which the linear-drift check covers.
  if (lambda === null || mu === null || mu === 0) return null;
  const h = (plan.t1 - plan.t0) / plan.steps;
  const factor = amplification(plan.method, lambda, mu, h);
  const stable = factor < 1;
  const name = SCHEME_NAMES[plan.method];
  const condition = `E[R²] = ${factor.toPrecision(4)} ${stable ? '<' : '≥'} 1`;
  // The model's own second moment decays iff 2λ + μ² < 0 (Itô); a Stratonovich model has Itô drift λ + μ²/2.
  const itoLambda = model.calculus === 'stratonovich' ? lambda + 0.5 * mu * mu : lambda;
  const modelDecays = 2 * itoLambda + mu * mu < 0;
  const model_ = `λ = ${lambda.toPrecision(4)}, μ = ${mu.toPrecision(4)}`;
  let message: string;
  if (stable) {
    message = `${name} with step ${h.toPrecision(4)} is mean-square stable for this linear model (${model_}; ${condition}).`;
  } else if (modelDecays) {
    message = `${name} with step ${h.toPrecision(4)} is NOT mean-square stable for this linear model (${model_}; ${condition}): the simulated second moment grows from step to step, although the model's own second moment decays. Try a smaller step.`;
  } else {
    // 2λ + μ² ≥ 0: the exact solution's second moment grows too, so no step size makes the scheme
    // mean-square stable, and its growth is no sign of a step that is too large.
    message = `This linear model's own second moment grows (${model_}; 2λ + μ² ≥ 0), so ${name}'s growing second moment (${condition}) is expected and does not call for a smaller step.`;
  }
  return {
    check: 'mean-square',
    scheme: plan.method,
    lambda,
    lambdaImag: 0,
    mu,
    h,
    time: plan.t0,
    stable,
    modelStable: modelDecays,
    amplification: factor,
    maxStableStep: stable || !modelDecays ? null : largestStableStep(plan.method, lambda, mu, h),
    message,
  };
}

/** The largest step ≤ h with E[R²] < 1 (bisection; the stable steps form an interval from 0 here). */
function largestStableStep(scheme: StabilityReport['scheme'], lambda: number, mu: number, h: number): number {
  let low = 0;
  let high = h;
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (low + high);
    if (amplification(scheme, lambda, mu, mid) < 1) low = mid;
    else high = mid;
  }
  return low;
}

/**
 * The run's stability report: the exact mean-square check for a scalar linear model with
 * multiplicative noise, else the linearised drift at the initial state and, when given, at the
 * mean state of each saved time (`savedTimes`, `meanStates[i][k]`); null when neither applies.
 */
export function stabilityReport(
  plan: SimulationPlan,
  along?: { savedTimes: Float64Array; meanStates: Float64Array[] },
): StabilityReport | null {
  const meanSquare = meanSquareStability(plan);
  if (meanSquare !== null) return meanSquare;
  const points = [{ time: plan.t0, state: Float64Array.from(plan.model.initial) }];
  if (along !== undefined) {
    for (let k = 1; k < along.savedTimes.length; k++) {
      points.push({
        time: along.savedTimes[k]!,
        state: Float64Array.from(along.meanStates, (means) => means[k]!),
      });
    }
  }
  return linearDriftStability(plan, points);
}
