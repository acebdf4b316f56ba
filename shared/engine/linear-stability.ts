import { EXPRESSION_PRELUDE } from '../expr';
import type { SimulationPlan } from './plan';
import type { StabilityReport } from './result';
import { compileGenerated } from './compile-generated';
import { eigenvalues } from './eigenvalues';

/**
 * Stability of the step for the linearised drift. Near a state x, dX ≈ J(x)(X − x) dt + noise, and
 * one step multiplies the mode of an eigenvalue λ of the Jacobian J by R(hλ): R(z) = 1 + z for
 * Euler–Maruyama and for Milstein (whose correction term only involves the diffusion), and
 * R(z) = 1 + z + z²/2 for stochastic Heun (its drift part is Heun's second-order Runge–Kutta
 * step). The step is unstable where |R(hλ)| > 1 although Re λ < 0 (Hairer & Wanner 1996, Solving
 * ODEs II, §IV.2). With additive noise that is also the mean-square condition (Higham 2000, §2:
 * E[X²] obeys the same recursion as the mean, plus a constant); with state-dependent noise it is
 * necessary, not sufficient.
 * Checked at the initial state and at the mean state of each saved time (at most MAX_POINTS).
 */
const MAX_POINTS = 33;
/**
 * A mode counts as unstable only if the step would grow it more than this factor over the whole
 * run: a lightly damped oscillation has |1 + hλ| a hair above 1 at any practical step, and a
 * growth of 1.0002 over a run is no reason to distrust it (a judgement; common practice, no source).
 */
const RUN_GROWTH_LIMIT = 2;
/** |R| within this of 1 counts as neutral, not unstable (rounding in the Jacobian). */
const NEUTRAL = 1e-9;

type Drift = (t: number, s: Float64Array, out: Float64Array) => void;

function compileDrift(plan: SimulationPlan): Drift {
  const d = plan.model.stateNames.length;
  const states = Array.from({ length: d }, (_, i) => `s${i} = s[${i}]`).join(', ');
  const assignments = plan.model.drift.map((source, i) => `out[${i}] = (${source});`).join(' ');
  // Built from the plan's checked drift sources (see plan.ts); evaluated a few hundred times.
  return compileGenerated<Drift>(
    ['t', 's', 'out'],
    `"use strict"; ${EXPRESSION_PRELUDE} const ${states}; ${assignments}`,
  );
}

/** Jacobian by central differences, row-major (Nocedal & Wright 2006, §8.1). */
function jacobian(drift: Drift, t: number, x: Float64Array): Float64Array {
  const d = x.length;
  const j = new Float64Array(d * d);
  const shifted = Float64Array.from(x);
  const plus = new Float64Array(d);
  const minus = new Float64Array(d);
  for (let k = 0; k < d; k++) {
    const delta = 1e-6 * Math.max(1, Math.abs(x[k]!));
    shifted[k] = x[k]! + delta;
    drift(t, shifted, plus);
    shifted[k] = x[k]! - delta;
    drift(t, shifted, minus);
    shifted[k] = x[k]!;
    for (let i = 0; i < d; i++) j[i * d + k] = (plus[i]! - minus[i]!) / (2 * delta);
  }
  return j;
}

/** |R(hλ)| for the scheme, λ = re + i·im. */
export function stepFactor(scheme: StabilityReport['scheme'], h: number, re: number, im: number): number {
  const zr = h * re;
  const zi = h * im;
  if (scheme !== 'heun') return Math.hypot(1 + zr, zi);
  return Math.hypot(1 + zr + 0.5 * (zr * zr - zi * zi), zi + zr * zi);
}

interface Point {
  time: number;
  state: Float64Array;
}

interface Mode {
  time: number;
  re: number;
  im: number;
  factor: number;
}

/** The largest step ≤ h at which every decaying mode has |R| ≤ 1 (bisection; the set is an interval from 0). */
function largestStableStep(scheme: StabilityReport['scheme'], h: number, modes: Mode[]): number | null {
  const decaying = modes.filter((mode) => mode.re < 0);
  if (decaying.length === 0) return null;
  const stableAt = (step: number) =>
    decaying.every((mode) => stepFactor(scheme, step, mode.re, mode.im) <= 1 + NEUTRAL);
  let low = 0;
  let high = h;
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (low + high);
    if (stableAt(mid)) low = mid;
    else high = mid;
  }
  return low;
}

/** A number for a message: 4 significant digits, a true minus sign. */
export function formatNumber(value: number): string {
  return String(Number(value.toPrecision(4))).replace('-', '−');
}

/** A factor near 1 shows its distance from 1, which is what matters. */
function formatFactor(value: number): string {
  const excess = value - 1;
  if (Math.abs(excess) >= 1e-3 || excess === 0) return formatNumber(value);
  return `1 ${excess > 0 ? '+' : '−'} ${Math.abs(excess).toExponential(1)}`;
}

function eigenvalueText(mode: Mode): string {
  if (mode.im === 0) return formatNumber(mode.re);
  return `${formatNumber(mode.re)} ± ${formatNumber(Math.abs(mode.im))}i`;
}

const SCHEME_NAMES: Record<StabilityReport['scheme'], string> = {
  'euler-maruyama': 'Euler–Maruyama',
  milstein: 'Milstein',
  heun: 'Stochastic Heun',
};

/**
 * The linear-drift report at the given points (the first is the initial state), or null when the
 * drift cannot be linearised there (not finite).
 */
export function linearDriftStability(plan: SimulationPlan, points: Point[]): StabilityReport | null {
  const d = plan.model.stateNames.length;
  const h = (plan.t1 - plan.t0) / plan.steps;
  let drift: Drift;
  try {
    drift = compileDrift(plan);
  } catch {
    return null;
  }
  const stride = Math.max(1, Math.ceil(points.length / MAX_POINTS));
  const modes: Mode[] = [];
  let worstBlamed: Mode | null = null;
  let worstAny: Mode | null = null;
  for (let q = 0; q < points.length; q += stride) {
    const point = points[q]!;
    if (!point.state.every(Number.isFinite)) continue;
    const { re, im } = eigenvalues(jacobian(drift, point.time, point.state), d);
    if (!re.every(Number.isFinite) || !im.every(Number.isFinite)) continue;
    for (let i = 0; i < d; i++) {
      const mode = {
        time: point.time,
        re: re[i]!,
        im: im[i]!,
        factor: stepFactor(plan.method, h, re[i]!, im[i]!),
      };
      modes.push(mode);
      // Ties (within rounding of the differences) keep the earlier point: the initial state first.
      if (worstAny === null || mode.factor > worstAny.factor * (1 + NEUTRAL)) worstAny = mode;
      if (mode.re < 0 && (worstBlamed === null || mode.factor > worstBlamed.factor * (1 + NEUTRAL)))
        worstBlamed = mode;
    }
  }
  if (worstAny === null) return null;
  const name = SCHEME_NAMES[plan.method];
  const where = (mode: Mode) =>
    mode.time === points[0]!.time && points[0]!.time === plan.t0
      ? `the initial state (t = ${formatNumber(plan.t0)})`
      : `the mean state at t = ${formatNumber(mode.time)}`;
  const base = { check: 'linear-drift' as const, scheme: plan.method, mu: null, h };
  const factorName = plan.method === 'heun' ? '|1 + hλ + (hλ)²/2|' : '|1 + hλ|';
  const runGrowth = (mode: Mode) => Math.exp(plan.steps * Math.log(mode.factor));
  if (worstBlamed !== null && worstBlamed.factor > 1 + NEUTRAL && runGrowth(worstBlamed) > RUN_GROWTH_LIMIT) {
    const mode = worstBlamed;
    const maxStableStep = largestStableStep(plan.method, h, modes);
    const hLambda =
      mode.im === 0 ? `hλ = ${formatNumber(h * mode.re)}` : `h·Re λ = ${formatNumber(h * mode.re)}`;
    const advice =
      maxStableStep !== null && maxStableStep > 0
        ? ` Try a smaller step: h below ${formatNumber(maxStableStep)} (more than ${Math.ceil((plan.t1 - plan.t0) / maxStableStep).toLocaleString('en')} steps).`
        : ' Try a smaller step.';
    return {
      ...base,
      lambda: mode.re,
      lambdaImag: mode.im,
      time: mode.time,
      stable: false,
      modelStable: true,
      amplification: mode.factor,
      maxStableStep,
      message: `${name} with step ${formatNumber(h)} is NOT stable for this drift: its Jacobian at ${where(mode)} has the eigenvalue λ = ${eigenvalueText(mode)} (${hLambda}), so every step multiplies that mode by ${factorName} = ${formatFactor(mode.factor)} > 1, although the model itself decays there. The numbers of this run grow because of the step, not the model.${advice}`,
    };
  }
  const growing = worstAny.re > 0;
  const mode = growing ? worstAny : (worstBlamed ?? worstAny);
  return {
    ...base,
    lambda: mode.re,
    lambdaImag: mode.im,
    time: mode.time,
    stable: !growing,
    modelStable: !growing,
    amplification: mode.factor,
    maxStableStep: null,
    message: growing
      ? `The linearised drift grows at ${where(mode)} (eigenvalue λ = ${eigenvalueText(mode)} with a positive real part), so the growth of ${name}'s numbers is the model's own and does not call for a smaller step.`
      : mode.factor > 1 + NEUTRAL
        ? `${name} with step ${formatNumber(h)} is stable enough for the linearised drift: the largest ${factorName} is ${formatFactor(mode.factor)} (at ${where(mode)}, eigenvalue λ = ${eigenvalueText(mode)}), which over the run's ${plan.steps.toLocaleString('en')} steps grows that mode by at most a factor ${formatNumber(runGrowth(mode))}.`
        : `${name} with step ${formatNumber(h)} is stable for the linearised drift: the largest ${factorName} over the initial state and the mean states of the run is ${formatFactor(mode.factor)} (at ${where(mode)}).`,
  };
}
