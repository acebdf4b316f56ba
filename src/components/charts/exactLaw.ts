import { checkExpression, evaluate } from '@shared/expr';
import type { ModelCell } from '@shared/sheet/document';

/**
 * Known laws of X_t for two textbook one-dimensional models, recognised from the model's own
 * coefficients (evaluated with the checked-tree evaluator, never with generated code):
 *
 *   Ornstein–Uhlenbeck (affine drift a + b·x, constant diffusion c): X_t is normal with
 *     mean  (x0 + a/b)·e^{bτ} − a/b,   variance  c²·(e^{2bτ} − 1)/(2b)      (b ≠ 0)
 *     mean  x0 + a·τ,                   variance  c²·τ                      (b = 0)
 *   (Kloeden & Platen 1992, §4.4, the linear SDE in the narrow sense; τ = t − t0.)
 *
 *   Geometric Brownian motion (drift μ·x, diffusion σ·x, x0 > 0): log X_t is normal with
 *     Itô:           mean log x0 + (μ − σ²/2)·τ,  variance σ²·τ
 *     Stratonovich:  mean log x0 + μ·τ,           variance σ²·τ
 *   (Kloeden & Platen 1992, §4.4, the linear SDE with multiplicative noise; Higham 2001, SIAM
 *   Review 43, the exact solution of the linear test equation.)
 */
export type ExactLaw =
  | { kind: 'normal'; model: 'Ornstein–Uhlenbeck'; mean: number; variance: number }
  | { kind: 'lognormal'; model: 'geometric Brownian motion'; logMean: number; logVariance: number };

export interface LawQuery {
  model: ModelCell;
  /** Resolved parameter values of the run (overrides applied). */
  params: Readonly<Record<string, number>>;
  x0: number;
  t0: number;
  t: number;
  /** A boundary (absorb, reflect) changes the law: no exact density then. */
  hasBoundary: boolean;
}

const PROBE_POINTS = [-1.3, 0.4, 2.7];
const RELATIVE_TOLERANCE = 1e-9;

export function exactLawAt(query: LawQuery): ExactLaw | null {
  const { model } = query;
  if (query.hasBoundary || model.states.length !== 1 || !(query.t > query.t0)) return null;
  const state = model.states[0]!;
  const noises = model.noises.filter((n) => (state.diffusion[n.name] ?? '0').trim() !== '0');
  if (noises.length !== 1) return null;
  const drift = compile(state.drift, model, query.params);
  const diffusion = compile(state.diffusion[noises[0]!.name]!, model, query.params);
  if (!drift || !diffusion) return null;

  const driftLine = affineFit((x, t) => drift(x, t), query.t0);
  const diffusionLine = affineFit((x, t) => diffusion(x, t), query.t0);
  if (!driftLine || !diffusionLine) return null;
  const tau = query.t - query.t0;

  if (diffusionLine.slope === 0) {
    const { intercept: a, slope: b } = driftLine;
    const c2 = diffusionLine.intercept ** 2;
    if (b === 0)
      return { kind: 'normal', model: 'Ornstein–Uhlenbeck', mean: query.x0 + a * tau, variance: c2 * tau };
    const growth = Math.exp(b * tau);
    return {
      kind: 'normal',
      model: 'Ornstein–Uhlenbeck',
      mean: (query.x0 + a / b) * growth - a / b,
      variance: (c2 * (growth * growth - 1)) / (2 * b),
    };
  }
  if (driftLine.intercept === 0 && diffusionLine.intercept === 0 && query.x0 > 0) {
    const mu = driftLine.slope;
    const sigma2 = diffusionLine.slope ** 2;
    const itoCorrection = model.calculus === 'ito' ? sigma2 / 2 : 0;
    return {
      kind: 'lognormal',
      model: 'geometric Brownian motion',
      logMean: Math.log(query.x0) + (mu - itoCorrection) * tau,
      logVariance: sigma2 * tau,
    };
  }
  return null;
}

/** Density of the law at x. */
export function lawDensity(law: ExactLaw, x: number): number {
  if (law.kind === 'normal') return normalDensity(x, law.mean, law.variance);
  if (!(x > 0)) return 0;
  return normalDensity(Math.log(x), law.logMean, law.logVariance) / x;
}

export function normalDensity(x: number, mean: number, variance: number): number {
  if (!(variance > 0)) return Number.NaN;
  return Math.exp(-((x - mean) ** 2) / (2 * variance)) / Math.sqrt(2 * Math.PI * variance);
}

type Coefficient = (x: number, t: number) => number;

function compile(
  text: string,
  model: ModelCell,
  params: Readonly<Record<string, number>>,
): Coefficient | null {
  const name = model.states[0]!.name;
  const checked = checkExpression(text, [...Object.keys(params), name, 't']);
  if (!checked.ok) return null;
  const tree = checked.tree;
  return (x, t) => evaluate(tree, { ...params, [name]: x, t });
}

/**
 * f as intercept + slope·x when it is exactly affine in x and does not depend on t; tested at
 * three points and two times, with a tolerance for rounding only. Exact zeros are snapped so a
 * pure multiplicative term is recognised as such.
 */
function affineFit(f: Coefficient, t0: number): { intercept: number; slope: number } | null {
  const [x1, x2, x3] = PROBE_POINTS as [number, number, number];
  const f1 = f(x1, t0);
  const f2 = f(x2, t0);
  const f3 = f(x3, t0);
  if (![f1, f2, f3].every(Number.isFinite)) return null;
  let slope = (f2 - f1) / (x2 - x1);
  let intercept = f1 - slope * x1;
  const scale = Math.max(Math.abs(f1), Math.abs(f2), Math.abs(f3), 1e-300);
  const close = (a: number, b: number) => Math.abs(a - b) <= RELATIVE_TOLERANCE * scale;
  if (!close(f3, intercept + slope * x3)) return null;
  if (!close(f(x1, t0 + 1.7), f1) || !close(f(x3, t0 + 0.31), f3)) return null;
  if (Math.abs(slope) <= RELATIVE_TOLERANCE * scale) slope = 0;
  if (Math.abs(intercept) <= RELATIVE_TOLERANCE * scale) intercept = 0;
  return { intercept, slope };
}
