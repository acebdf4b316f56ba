import { EXPRESSION_PRELUDE } from '../expr';
import type { SimulationPlan } from './plan';
import type { StudyLevel, StudyOptions, StudyResult } from './result';
import { planLayout } from './layout';
import { compileIncrementKernel, type IncrementContext } from './kernel';
import { streamSeed } from './random/stream-seed';
import { Xoshiro128 } from './random/xoshiro128';
import { normalFrom } from './random/ziggurat';
import { fitSlope } from './regression';
import { compileGenerated } from './compile-generated';
import { MAX_STEPS } from './limits';
import { PORTABLE_MATH } from '../expr/portable-math';

type ExactSolution = (t: number, initial: Float64Array, brownian: Float64Array) => number;

function compileExact(plan: SimulationPlan, state: number): ExactSolution {
  const d = plan.model.stateNames.length;
  const m = plan.model.noiseNames.length;
  const names = [
    ...Array.from({ length: d }, (_, i) => `s${i} = initial[${i}]`),
    ...Array.from({ length: m }, (_, j) => `w${j} = brownian[${j}]`),
  ];
  // Built from the plan's checked exact-solution source (see plan.ts); evaluated once per sample.
  const body = `"use strict"; ${EXPRESSION_PRELUDE} const ${names.length > 0 ? names.join(', ') : '_unused = 0'}; return (${plan.model.exact[state]!});`;
  return compileGenerated<ExactSolution>(['t', 'initial', 'brownian'], body);
}

function checkOptions(plan: SimulationPlan, options: StudyOptions): void {
  const d = plan.model.stateNames.length;
  if (!Number.isInteger(options.levels) || options.levels < 2 || options.levels > 16)
    throw new RangeError(`a study needs 2 to 16 levels, got ${options.levels}`);
  if (!Number.isInteger(options.coarsestSteps) || options.coarsestSteps < 1)
    throw new RangeError(`the coarsest level needs at least one step, got ${options.coarsestSteps}`);
  if (!Number.isInteger(options.paths) || options.paths < 2)
    throw new RangeError(`a study needs at least 2 paths, got ${options.paths}`);
  if (!Number.isInteger(options.state) || options.state < 0 || options.state >= d)
    throw new RangeError(`the study names state ${options.state}, which does not exist`);
  const finest = options.coarsestSteps * 2 ** (options.levels - 1);
  if (finest > MAX_STEPS)
    throw new RangeError(
      `the finest level would have ${finest} steps; use fewer levels or fewer coarsest steps`,
    );
}

/** Mean and standard error of the mean of the first n entries. */
function meanAndSE(values: Float64Array, n: number): [number, number] {
  let sum = 0;
  for (let i = 0; i < n; i++) sum += values[i]!;
  const mean = sum / n;
  let squares = 0;
  for (let i = 0; i < n; i++) squares += (values[i]! - mean) ** 2;
  return [mean, Math.sqrt(squares / (n - 1) / n)];
}

/**
 * Step-size study. Each sample draws ONE Brownian path at the finest level (from the same
 * per-path stream as a run) and every coarser level sums its increments, so all levels see the
 * same noise and the differences between levels are discretisation error, not sampling noise.
 * Errors at T = t1 against the exact solution at the sample's W_T where the model has one, else
 * against the finest level (which is then not fitted). Orders are least-squares slopes of
 * log error on log h.
 *   strong error  E|X_h(T) − X_ref(T)|   (Kloeden & Platen 1992, §9.6)
 *   weak error    |E[X_h(T) − X_ref(T)]| (same samples, so the difference has small variance)
 */
export function runStudy(plan: SimulationPlan, options: StudyOptions): StudyResult {
  const layout = planLayout(plan);
  checkOptions(plan, options);
  const { state, levels, coarsestSteps, paths } = options;
  const hasExact = plan.model.exact[state] !== null && plan.model.exact[state] !== undefined;
  if (options.reference === 'exact' && !hasExact) {
    throw new RangeError(
      `the study asks for the exact solution, but ${plan.model.stateNames[state]} has none; use the finest level as reference`,
    );
  }
  const reference = options.reference === 'finest' || !hasExact ? 'finest' : 'exact';
  const exact = reference === 'exact' ? compileExact(plan, state) : null;
  const kernel = compileIncrementKernel(plan, layout);

  const d = layout.stateCount;
  const m = layout.noiseCount;
  const horizon = plan.t1 - plan.t0;
  const finestSteps = coarsestSteps * 2 ** (levels - 1);
  const fineH = horizon / finestSteps;
  const sqrtFineH = Math.sqrt(fineH);
  const fine = new Float64Array(finestSteps * m);
  const coarse = new Float64Array(finestSteps * m);
  const z = new Float64Array(m);
  const brownian = new Float64Array(m);
  const initial = Float64Array.from(plan.model.initial);
  const seedState = new Uint32Array(4);
  const ctx: IncrementContext = { increments: coarse, out: new Float64Array(d), steps: 0, h: 0 };
  // values[level · paths + sample]; a sample that blows up at any level is dropped.
  const values = new Float64Array(levels * paths);
  const referenceValues = new Float64Array(paths);
  let kept = 0;

  for (let sample = 0; sample < paths; sample++) {
    streamSeed(plan.seed, sample, seedState);
    const generator = new Xoshiro128(seedState);
    brownian.fill(0);
    for (let n = 0; n < finestSteps; n++) {
      for (let j = 0; j < m; j++) z[j] = normalFrom(generator);
      for (let j = 0; j < m; j++) {
        let correlated = z[j]!;
        if (layout.cholesky !== null) {
          correlated = 0;
          for (let k = 0; k <= j; k++) correlated += layout.cholesky[j * m + k]! * z[k]!;
        }
        const increment = correlated * sqrtFineH;
        fine[n * m + j] = increment;
        brownian[j] = brownian[j]! + increment;
      }
    }
    let blown = false;
    for (let level = 0; level < levels && !blown; level++) {
      const steps = coarsestSteps * 2 ** level;
      const group = finestSteps / steps;
      for (let n = 0; n < steps; n++) {
        for (let j = 0; j < m; j++) {
          let sum = 0;
          for (let g = 0; g < group; g++) sum += fine[(n * group + g) * m + j]!;
          coarse[n * m + j] = sum;
        }
      }
      ctx.steps = steps;
      ctx.h = horizon / steps;
      blown = kernel(ctx) === 1 || !Number.isFinite(ctx.out[state]!);
      values[level * paths + kept] = ctx.out[state]!;
    }
    const referenceValue =
      exact === null ? values[(levels - 1) * paths + kept]! : exact(plan.t1, initial, brownian);
    if (blown || !Number.isFinite(referenceValue)) continue;
    referenceValues[kept] = referenceValue;
    kept++;
  }
  if (kept < 2)
    throw new RangeError(
      'fewer than two samples stayed finite at every level; the study cannot estimate errors (try smaller steps)',
    );

  const fittedLevels = reference === 'finest' ? levels - 1 : levels;
  const difference = new Float64Array(kept);
  const absolute = new Float64Array(kept);
  const results: StudyLevel[] = [];
  for (let level = 0; level < fittedLevels; level++) {
    for (let sample = 0; sample < kept; sample++) {
      difference[sample] = values[level * paths + sample]! - referenceValues[sample]!;
      absolute[sample] = Math.abs(difference[sample]!);
    }
    const [strongError, strongSE] = meanAndSE(absolute, kept);
    const [meanDifference, weakSE] = meanAndSE(difference, kept);
    const steps = coarsestSteps * 2 ** level;
    results.push({
      steps,
      h: horizon / steps,
      strongError,
      strongSE,
      weakError: Math.abs(meanDifference),
      weakSE,
    });
  }

  const fit = (pick: (level: StudyLevel) => number) => {
    const usable = results.filter((level) => pick(level) > 0 && Number.isFinite(pick(level)));
    return fitSlope(
      usable.map((level) => PORTABLE_MATH.log(level.h)),
      usable.map((level) => PORTABLE_MATH.log(pick(level))),
    );
  };
  const strong = fit((level) => level.strongError);
  const weak = fit((level) => level.weakError);
  const noisy = results.filter((level) => level.weakError < 2 * level.weakSE).map((level) => level.steps);
  const notes = [
    noisy.length > 0
      ? `the weak error at ${noisy.join(', ')} steps is within twice its standard error (Monte Carlo noise); the weak order is uncertain`
      : '',
    reference === 'finest'
      ? `errors are measured against the finest level (${finestSteps} steps), which is not fitted`
      : '',
    kept < paths ? `${paths - kept} samples blew up at some level and are left out` : '',
  ].filter((note) => note !== '');

  return {
    levels: results,
    strongOrder: strong.slope,
    strongOrderSE: strong.slopeSE,
    strongOrderCI: strong.ci,
    weakOrder: weak.slope,
    weakOrderSE: weak.slopeSE,
    weakOrderCI: weak.ci,
    reference,
    paths: kept,
    excluded: paths - kept,
    ...(notes.length > 0 ? { note: notes.join('; ') } : {}),
  };
}
