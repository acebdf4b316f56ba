import { RunCancelledError } from '../run/chunk-pool';
import type { RunProgress } from '../run/progress';
import { compileFitModel, type CompiledFitModel } from './compile';
import { eulerLikelihood } from './euler-likelihood';
import { exactLikelihood } from './exact-likelihood';
import { covarianceFromInformation, numericalHessian } from './hessian';
import type { Likelihood } from './likelihood';
import { minimise } from './optimise';
import type { FitEstimate, FitProblem, FitResult } from './problem';
import { residualCheck } from './residual-check';
import { simulatedLikelihood } from './simulated-likelihood';
import { startPoints } from './starts';
import { startProblem, transformFor } from './transform';
import { medianInterval, transitionsOf, type Transitions } from './transitions';
import { timeScaleWarnings } from './time-scale';

/**
 * One fit from start to end, on whatever thread runs it (a worker in the browser): compile the
 * model, build the chosen likelihood, maximise it from each start (Nelder–Mead on bounded
 * parameters through transforms), then standard errors from the observed information, 95 %
 * Wald intervals, AIC and the residual check. Problems that stop a fit before it starts throw
 * with a plain message; a fit that runs but fails comes back with `ok: false` and advice.
 */

export interface FitHooks {
  onProgress?(progress: RunProgress): void;
  /** Asked between likelihood evaluations; true stops the fit with RunCancelledError. */
  shouldStop?(): boolean;
}

const Z95 = 1.959963984540054;
const PROGRESS_EVERY_MS = 200;

export function buildLikelihood(
  problem: FitProblem,
  model: CompiledFitModel,
  transitions: Transitions,
): Likelihood {
  const { correlation } = problem.model;
  if (problem.method === 'exact') {
    if (problem.exactForm === null)
      throw new RangeError('the exact likelihood is not available for this model; pick Euler or simulated');
    return exactLikelihood(problem.exactForm, model, correlation, transitions);
  }
  if (problem.method === 'euler') return eulerLikelihood(model, correlation, transitions);
  return simulatedLikelihood(model, correlation, transitions, problem.simulated);
}

export function fitModel(problem: FitProblem, hooks: FitHooks = {}): FitResult {
  const started = performance.now();
  for (const parameter of problem.parameters) {
    const issue = startProblem(parameter);
    if (issue) throw new RangeError(issue);
  }
  const k = problem.parameters.length;
  if (k === 0) throw new RangeError('pick at least one parameter to estimate');
  const model = compileFitModel(problem.model);
  const transitions = transitionsOf(problem.series, model.d);
  if (transitions.count < k + 2)
    throw new RangeError(
      `${transitions.count} observed transitions are too few to estimate ${k} parameters; a series needs at least two observations, and more data than parameters`,
    );
  const likelihood = buildLikelihood(problem, model, transitions);
  const transforms = problem.parameters.map(transformFor);
  const toTheta = (z: readonly number[]) => Float64Array.from(z, (v, i) => transforms[i]!.toParameter(v));

  const budget = problem.starts * 300 * k * 4 + 2 * k * k + 1;
  let evaluations = 0;
  let lastReport = started;
  const negativeLogLikelihood = (theta: Float64Array): number => {
    evaluations++;
    const now = performance.now();
    if (now - lastReport >= PROGRESS_EVERY_MS) {
      if (hooks.shouldStop?.()) throw new RunCancelledError();
      lastReport = now;
      const done = Math.min(evaluations, budget - 1);
      const elapsedMs = now - started;
      hooks.onProgress?.({
        pathsDone: done,
        paths: budget,
        elapsedMs,
        etaMs: (elapsedMs * (budget - done)) / done,
        unit: 'likelihood evaluations',
      });
    }
    return -likelihood.logLikelihood(theta);
  };
  const objective = (z: number[]) => negativeLogLikelihood(toTheta(z));

  const starts = startPoints(problem, transforms);
  const base = {
    method: problem.method,
    observations: problem.series.reduce((sum, s) => sum + s.times.length, 0),
    transitions: transitions.count,
    groups: problem.series.length,
  };
  if (!Number.isFinite(objective(starts[0]!))) {
    return failed(
      problem,
      base,
      evaluations,
      started,
      'the likelihood cannot be computed at the starting values',
      [
        'check that every observed state feels some noise at the starting values (a diffusion of zero leaves no likelihood)',
        'move the starting values in the parameters cell closer to what the data suggest',
        ...(problem.method === 'exact' ? [] : ['try the exact likelihood where the model offers it']),
      ],
    );
  }
  const steps = problem.parameters.map((p) =>
    p.lower !== null || p.upper !== null ? 0.3 : 0.1 * Math.max(Math.abs(p.start), 1),
  );
  const outcomes = starts.map((z0) => minimise(objective, z0, { step: steps }));
  const best = outcomes.reduce((a, b) => (b.value < a.value ? b : a));
  if (!(best.value < Number.MAX_VALUE))
    return failed(
      problem,
      base,
      evaluations,
      started,
      'no start reached a point where the likelihood is defined',
      ['move the starting values, or widen the bounds in the parameters cell'],
    );
  const startsBelowBest = outcomes.filter((o) => o.value - best.value > 0.5).length;
  const theta = toTheta(best.z);
  const logLikelihood = -best.value;

  // Observed information in the parameters' own units, steps kept inside the bounds.
  const h = problem.parameters.map((p, i) => {
    const value = theta[i]!;
    let step = 1e-4 * Math.max(Math.abs(value), 1e-2);
    if (p.lower !== null) step = Math.min(step, (value - p.lower) / 3);
    if (p.upper !== null) step = Math.min(step, (p.upper - value) / 3);
    return step;
  });
  const information = numericalHessian((x) => negativeLogLikelihood(Float64Array.from(x)), [...theta], h);
  const covariance = h.every((step) => step > 0) ? covarianceFromInformation(information) : null;
  const estimates: FitEstimate[] = problem.parameters.map((p, i) => {
    const estimate = theta[i]!;
    const atBound = Math.abs(best.z[i]!) > 12 && (p.lower !== null || p.upper !== null);
    const variance = covariance?.get(i, i);
    const standardError = variance !== undefined && variance > 0 ? Math.sqrt(variance) : null;
    return {
      name: p.name,
      unit: p.unit,
      estimate,
      standardError,
      ci:
        standardError === null
          ? [null, null]
          : [estimate - Z95 * standardError, estimate + Z95 * standardError],
      atBound,
    };
  });

  const check = residualCheck(likelihood.residuals(theta));
  const warnings = [
    ...timeScaleWarnings(problem, model, transitions, theta, medianInterval(transitions)),
    ...estimates
      .filter((e) => e.atBound)
      .map(
        (e) =>
          `${e.name} ran against a bound of its range; its interval means little: widen the range or fix ${e.name}`,
      ),
    ...(covariance === null
      ? [
          'standard errors are not available: the likelihood is flat or not at a maximum in some direction (too many parameters for these data, or two that trade off)',
        ]
      : []),
    ...(check.ksPValue !== null && check.ksPValue < 0.01
      ? [
          `the residuals do not look standard normal (Kolmogorov–Smirnov p = ${check.ksPValue.toPrecision(2)}): the model may not describe these data`,
        ]
      : []),
    ...(startsBelowBest > 0
      ? [
          `${startsBelowBest} of ${starts.length} starts stopped at a lower peak of the likelihood: it has more than one peak; the best is shown`,
        ]
      : []),
    ...(problem.droppedRows > 0
      ? [
          `${problem.droppedRows} observations with a missing value were left out; the intervals around them were joined`,
        ]
      : []),
  ];
  const converged = best.converged && covariance !== null;
  const convergence = best.converged
    ? covariance !== null
      ? `converged: a fresh search from the best point found nothing better (${best.searches} searches, ${evaluations} likelihood evaluations)`
      : 'stopped at a point where the likelihood is flat or not a maximum in some direction'
    : `not converged: the search was still improving after ${best.searches} searches (${evaluations} likelihood evaluations)`;
  const advice = converged
    ? []
    : [
        'start from values closer to what the data suggest (edit the parameters cell), or ask for several starts',
        'estimate fewer parameters: fix the ones the data say little about',
        ...(covariance === null ? ['narrow the ranges of parameters that trade off against each other'] : []),
      ];
  return {
    ...base,
    ok: true,
    estimates,
    logLikelihood,
    aic: 2 * k - 2 * logLikelihood,
    evaluations,
    converged,
    convergence,
    advice,
    warnings,
    residuals: { ...check, basis: likelihood.residualBasis },
    startsBelowBest,
    seconds: (performance.now() - started) / 1000,
  };
}

function failed(
  problem: FitProblem,
  base: Pick<FitResult, 'method' | 'observations' | 'transitions' | 'groups'>,
  evaluations: number,
  started: number,
  why: string,
  advice: string[],
): FitResult {
  return {
    ...base,
    ok: false,
    estimates: problem.parameters.map((p) => ({
      name: p.name,
      unit: p.unit,
      estimate: Number.NaN,
      standardError: null,
      ci: [null, null],
      atBound: false,
    })),
    logLikelihood: Number.NaN,
    aic: Number.NaN,
    evaluations,
    converged: false,
    convergence: `failed: ${why}`,
    advice,
    warnings: [],
    residuals: { count: 0, ksStatistic: null, ksPValue: null, qq: [], basis: '' },
    startsBelowBest: 0,
    seconds: (performance.now() - started) / 1000,
  };
}
