// Over 300 lines on purpose: every probe quantity reads the same result with the same rules for
// lost paths, warnings and notes, and one dispatch keeps those rules in one place.
import type { ProbeEstimate, ProbeRequest, SimulationResult } from './result';
import { moments, quantileSorted, sortFinite } from './statistics';
import { pairMoments } from './covariance';
import { PORTABLE_MATH } from '../expr/portable-math';

/** Two-sided 95 % normal quantile, z_{0.975}. */
export const Z95 = 1.959963984540054;

/**
 * Wilson (1927) score interval for a proportion, "Probable inference, the law of succession, and
 * statistical inference", JASA 22: centre (p̂ + z²/2n)/(1 + z²/n), half-width
 * z/(1 + z²/n) · √(p̂(1 − p̂)/n + z²/4n²).
 */
export function wilsonInterval(successes: number, trials: number, z = Z95): [number, number] {
  if (trials === 0) return [0, 1];
  const p = successes / trials;
  const z2n = (z * z) / trials;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z / (1 + z2n)) * Math.sqrt((p * (1 - p)) / trials + (z * z) / (4 * trials * trials));
  // At 0 or n successes the end is exactly 0 or 1 (the formula gives it up to rounding: 4e-19).
  return [
    successes === 0 ? 0 : Math.max(0, centre - half),
    successes === trials ? 1 : Math.min(1, centre + half),
  ];
}

function proportion(successes: number, trials: number, note?: string): ProbeEstimate {
  const p = trials > 0 ? successes / trials : NaN;
  return {
    estimate: p,
    standardError: trials > 0 ? Math.sqrt((p * (1 - p)) / trials) : NaN,
    ci: wilsonInterval(successes, trials),
    paths: trials,
    ...(note === undefined ? {} : { note }),
  };
}

/** A note for a small loss (at most LOSS_SHARE_LIMIT); a larger one is a warning instead. */
function lossNote(result: SimulationResult): string | undefined {
  const { count, conditional } = result.losses;
  return count > 0 && !conditional
    ? `${count} of ${result.paths} paths were lost and are left out`
    : undefined;
}

/** What every estimate of this run must carry: an unstable step, conditional on surviving paths. */
function runWarnings(result: SimulationResult): string[] {
  const { losses, stability } = result;
  const warnings: string[] = [];
  if (stability !== null && !stability.stable && stability.modelStable) {
    warnings.push(
      `the step is unstable for this model (see the simulation): this estimate reflects the scheme's growth, not the model`,
    );
  }
  if (losses.conditional) {
    const survivors = losses.paths - losses.count;
    warnings.push(
      `conditional on the ${survivors.toLocaleString('en')} surviving paths: ${losses.count.toLocaleString('en')} of ${losses.paths.toLocaleString('en')} were lost (see the simulation), so this is not an estimate for the model itself`,
    );
  }
  return warnings;
}

function joinNotes(...notes: (string | undefined)[]): string | undefined {
  const present = notes.filter((note): note is string => note !== undefined && note !== '');
  return present.length > 0 ? present.join('; ') : undefined;
}

/** Path values of one state at `time` (t1 by default): from the probe times, else the saved grid. */
export function valuesAt(
  result: SimulationResult,
  state: number,
  time: number | undefined,
): { time: number; values: Float64Array } {
  if (time === undefined || Math.abs(time - result.t1) <= result.h / 2)
    return { time: result.t1, values: result.finalValues[state]! };
  for (const probe of result.probes) {
    if (probe.requested === time || Math.abs(probe.time - time) <= result.h / 2)
      return { time: probe.time, values: probe.values[state]! };
  }
  let nearest = 0;
  result.savedTimes.forEach((saved, k) => {
    if (Math.abs(saved - time) < Math.abs(result.savedTimes[nearest]! - time)) nearest = k;
  });
  if (Math.abs(result.savedTimes[nearest]! - time) <= result.h / 2) {
    return {
      time: result.savedTimes[nearest]!,
      values: result.savedValues[state]!.subarray(nearest * result.paths, (nearest + 1) * result.paths),
    };
  }
  throw new RangeError(
    `no path values were kept at t = ${time}; the nearest saved time is ${result.savedTimes[nearest]}. Ask for this time in a probe before the run, or read the probe at a saved time.`,
  );
}

function lost(result: SimulationResult, path: number): boolean {
  return result.blowupTime[path] === result.blowupTime[path];
}

function requireLevel(probe: ProbeRequest): number {
  if (probe.level === undefined || !Number.isFinite(probe.level))
    throw new RangeError(`the ${probe.quantity} probe needs a level`);
  return probe.level;
}

function mean(values: ArrayLike<number>, note: string | undefined): ProbeEstimate {
  const m = moments(values);
  const standardError = Math.sqrt(m.variance / m.count);
  return {
    estimate: m.mean,
    standardError,
    ci: [m.mean - Z95 * standardError, m.mean + Z95 * standardError],
    paths: m.count,
    ...(note ? { note } : {}),
  };
}

/**
 * Variance with the large-sample standard error of s²: Var(s²) ≈ (μ₄ − σ⁴(n − 3)/(n − 1))/n
 * (e.g. Cramér 1946, §27.4), with the sample fourth central moment for μ₄; normal interval.
 */
function variance(values: ArrayLike<number>, note: string | undefined): ProbeEstimate {
  const m = moments(values);
  const n = m.count;
  const s2 = m.variance;
  const standardError = Math.sqrt(Math.max(0, m.fourthCentral - (s2 * s2 * (n - 3)) / (n - 1)) / n);
  return {
    estimate: s2,
    standardError,
    ci: [s2 - Z95 * standardError, s2 + Z95 * standardError],
    paths: n,
    ...(note ? { note } : {}),
  };
}

/**
 * Type-7 quantile with a distribution-free interval from order statistics: the ranks
 * ⌊np − z√(np(1−p))⌋ and ⌈np + z√(np(1−p))⌉ (normal approximation to the binomial; Conover 1999,
 * Practical Nonparametric Statistics, §3.2). The standard error is the interval's width / 2z.
 */
export function quantileEstimate(
  values: ArrayLike<number>,
  probability: number,
  note?: string,
): ProbeEstimate {
  if (!(probability > 0 && probability < 1))
    throw new RangeError(`a quantile's probability lies strictly between 0 and 1, got ${probability}`);
  const scratch = new Float64Array(values.length);
  const n = sortFinite(values, scratch);
  if (n === 0)
    return {
      estimate: NaN,
      standardError: NaN,
      ci: [NaN, NaN],
      paths: 0,
      note: joinNotes(note, 'no live paths'),
    };
  const estimate = quantileSorted(scratch, n, probability);
  const spread = Z95 * Math.sqrt(n * probability * (1 - probability));
  const lowerRank = Math.max(1, Math.floor(n * probability - spread));
  const upperRank = Math.min(n, Math.ceil(n * probability + spread));
  const ci: [number, number] = [scratch[lowerRank - 1]!, scratch[upperRank - 1]!];
  return { estimate, standardError: (ci[1] - ci[0]) / (2 * Z95), ci, paths: n, ...(note ? { note } : {}) };
}

function secondState(result: SimulationResult, probe: ProbeRequest): number {
  const y = probe.stateY;
  if (y === undefined || !Number.isInteger(y) || y < 0 || y >= result.stateNames.length || y === probe.state)
    throw new RangeError(`the ${probe.quantity} probe needs a second state, different from the first`);
  return y;
}

/**
 * Covariance of two states at a time, unbiased, with the large-sample standard error of the
 * sample covariance √((m₂₂ − s²ₓᵧ)/n), m₂₂ the mean of ((x − x̄)(y − ȳ))² (delta method; e.g.
 * Cramér 1946, §27.8); normal 95 % interval.
 */
function covarianceEstimate(result: SimulationResult, probe: ProbeRequest, note?: string): ProbeEstimate {
  const y = secondState(result, probe);
  const m = pairMoments(
    valuesAt(result, probe.state, probe.time).values,
    valuesAt(result, y, probe.time).values,
  );
  const standardError = Math.sqrt(Math.max(0, m.productSquare - m.covariance ** 2) / m.count);
  return {
    estimate: m.covariance,
    standardError,
    ci: [m.covariance - Z95 * standardError, m.covariance + Z95 * standardError],
    paths: m.count,
    ...(note ? { note } : {}),
  };
}

/**
 * Pearson correlation of two states at a time. Interval by Fisher's transform (Fisher 1921):
 * atanh(r) ± z/√(n − 3), mapped back with tanh; standard error (1 − r²)/√(n − 3), its delta-method
 * counterpart. Both assume a joint law not far from normal, which the note says.
 */
function correlationEstimate(result: SimulationResult, probe: ProbeRequest, note?: string): ProbeEstimate {
  const y = secondState(result, probe);
  const m = pairMoments(
    valuesAt(result, probe.state, probe.time).values,
    valuesAt(result, y, probe.time).values,
  );
  const r = m.covariance / Math.sqrt(m.varianceX * m.varianceY);
  const fisherNote = 'interval by Fisher’s transform, which assumes a joint law close to normal';
  if (!(m.count > 3) || !Number.isFinite(r))
    return {
      estimate: r,
      standardError: NaN,
      ci: [NaN, NaN],
      paths: m.count,
      note: joinNotes(note, fisherNote),
    };
  const half = Z95 / Math.sqrt(m.count - 3);
  // Fisher's z = atanh(r) = ½·log1p(2r/(1 − r)), through the portable log1p.
  const clipped = Math.max(-1, Math.min(1, r));
  const z = 0.5 * PORTABLE_MATH.log1p((2 * clipped) / (1 - clipped));
  return {
    estimate: r,
    standardError: (1 - r * r) / Math.sqrt(m.count - 3),
    ci: [PORTABLE_MATH.tanh(z - half), PORTABLE_MATH.tanh(z + half)],
    paths: m.count,
    note: joinNotes(note, fisherNote),
  };
}

function watchIndex(
  result: SimulationResult,
  state: number,
  level: number,
  direction: 'above' | 'below',
  monitoring: ProbeRequest['monitoring'] = 'discrete',
): number {
  const correction = monitoring === 'bgk' ? 'bgk' : 'none';
  return result.watches.findIndex(
    (watch) =>
      watch.state === state &&
      watch.level === level &&
      watch.direction === direction &&
      (watch.correction ?? 'none') === correction,
  );
}

/** How a crossing probe watched its level, in words (said on the probe's output). */
function monitoringText(result: SimulationResult, watch: number): string {
  const spec = result.watches[watch];
  const steps = `${result.steps.toLocaleString('en')} steps`;
  if (spec === undefined || (spec.correction ?? 'none') === 'none') {
    return `discrete monitoring: the level is checked at the ${steps} only, so crossings between steps are missed and crossing probabilities are biased low (choose the continuity correction, or more steps)`;
  }
  const shift = Math.abs(result.watchLevels[watch]! - spec.level);
  return `continuity-corrected (Broadie–Glasserman–Kou): checked at the ${steps} against the level moved ${shift.toPrecision(3)} (0.5826·σ·√h) toward the start`;
}

/** Hit indicator per live path: reached `level` from `direction` by `time` (also read by paired-difference.ts). */
export function hits(
  result: SimulationResult,
  probe: ProbeRequest,
  level: number,
  direction: 'above' | 'below',
): { hit: Uint8Array; live: Uint8Array; watch: number } {
  const time = probe.time ?? result.t1;
  const watch = watchIndex(result, probe.state, level, direction, probe.monitoring);
  if (watch < 0 && probe.monitoring === 'bgk')
    throw new RangeError(
      `the continuity correction needs the level ${level} to be watched with it during the run`,
    );
  const hit = new Uint8Array(result.paths);
  const live = new Uint8Array(result.paths);
  const atEnd = Math.abs(time - result.t1) <= result.h / 2;
  if (watch < 0 && !atEnd) {
    throw new RangeError(
      `P(hit ${level} before t = ${time}) needs the level to be watched during the run; only t1 = ${result.t1} can be read from the running extremes`,
    );
  }
  if (watch < 0 && !extremesRecorded(result, probe.state)) {
    throw new RangeError(
      `P(hit ${level}) needs the level to be watched during the run; this run did not keep running extremes`,
    );
  }
  for (let p = 0; p < result.paths; p++) {
    if (lost(result, p)) continue;
    live[p] = 1;
    if (watch >= 0) {
      const passage = result.firstPassage[watch]![p]!;
      hit[p] = passage <= time + result.h / 2 ? 1 : 0;
    } else if (direction === 'above') {
      hit[p] = result.runningMax[probe.state]![p]! >= level ? 1 : 0;
    } else {
      hit[p] = result.runningMin[probe.state]![p]! <= level ? 1 : 0;
    }
  }
  return { hit, live, watch };
}

/** Whether the run kept running extremes (a plan with recordExtremes: false leaves them NaN). */
function extremesRecorded(result: SimulationResult, state: number): boolean {
  for (let p = 0; p < result.paths; p++) {
    if (!lost(result, p)) return !Number.isNaN(result.runningMax[state]![p]!);
  }
  return true;
}

function firstPassage(result: SimulationResult, probe: ProbeRequest): ProbeEstimate {
  const level = requireLevel(probe);
  const direction = probe.direction ?? 'above';
  const watch = watchIndex(result, probe.state, level, direction, probe.monitoring);
  if (watch < 0)
    throw new RangeError(
      `first-passage times to ${level} (${direction}) were not recorded: the level must be watched during the run`,
    );
  const time = probe.time ?? result.t1;
  const reached: number[] = [];
  let live = 0;
  for (let p = 0; p < result.paths; p++) {
    if (lost(result, p)) continue;
    live++;
    const passage = result.firstPassage[watch]![p]!;
    if (passage <= time + result.h / 2) reached.push(passage);
  }
  const note = joinNotes(
    `${reached.length} of ${live} paths reached ${level} by t = ${time}`,
    lossNote(result),
  );
  const times = Float64Array.from(reached);
  const monitoring = monitoringText(result, watch);
  if (probe.probability !== undefined)
    return { ...quantileEstimate(times, probe.probability, note), monitoring };
  if (times.length < 2)
    return {
      estimate: times.length === 1 ? times[0]! : NaN,
      standardError: NaN,
      ci: [NaN, NaN],
      paths: times.length,
      monitoring,
      ...(note ? { note } : {}),
    };
  return { ...mean(times, note), monitoring };
}

function extinction(result: SimulationResult, probe: ProbeRequest): ProbeEstimate {
  const time = probe.time ?? result.t1;
  const absorbing = result.extinctions.some((summary) => summary.state === probe.state);
  if (!absorbing && probe.level === undefined) {
    throw new RangeError(
      `extinction of ${result.stateNames[probe.state]} needs an absorbing boundary on it or a level`,
    );
  }
  const fromLevel = probe.level === undefined ? null : hits(result, probe, probe.level, 'below');
  const absorbed = result.absorptionTime[probe.state]!;
  let live = 0;
  let extinct = 0;
  for (let p = 0; p < result.paths; p++) {
    if (lost(result, p)) continue;
    live++;
    if (absorbed[p]! <= time + result.h / 2 || (fromLevel !== null && fromLevel.hit[p] === 1)) extinct++;
  }
  return proportion(extinct, live, lossNote(result));
}

/**
 * A statistic read from a run with its standard error and 95 % interval. Lost paths are left
 * out: a small loss is noted, a larger one (LOSS_SHARE_LIMIT) makes the estimate conditional on
 * the survivors, which its warnings say; a run that lost every path has no estimate (RangeError).
 * Proportions use the Wilson interval and SE √(p(1 − p)/n).
 */
export function evaluateProbe(result: SimulationResult, probe: ProbeRequest): ProbeEstimate {
  if (result.losses.allLost) {
    throw new RangeError(
      `no estimate: every path was lost (${result.losses.message ?? ''} ${result.losses.advice.join('; ')})`.trim(),
    );
  }
  const estimate = estimateProbe(result, probe);
  const warnings = runWarnings(result);
  return warnings.length > 0
    ? { ...estimate, warnings: [...(estimate.warnings ?? []), ...warnings] }
    : estimate;
}

function estimateProbe(result: SimulationResult, probe: ProbeRequest): ProbeEstimate {
  if (!Number.isInteger(probe.state) || probe.state < 0 || probe.state >= result.stateNames.length) {
    throw new RangeError(`the probe names state ${probe.state}, which does not exist`);
  }
  const note = lossNote(result);
  switch (probe.quantity) {
    case 'mean':
      return mean(valuesAt(result, probe.state, probe.time).values, note);
    case 'variance':
      return variance(valuesAt(result, probe.state, probe.time).values, note);
    case 'quantile': {
      if (probe.probability === undefined) throw new RangeError('a quantile probe needs a probability');
      return quantileEstimate(valuesAt(result, probe.state, probe.time).values, probe.probability, note);
    }
    case 'exceedance':
    case 'subceedance': {
      const level = requireLevel(probe);
      const { values } = valuesAt(result, probe.state, probe.time);
      let live = 0;
      let count = 0;
      for (let p = 0; p < values.length; p++) {
        const value = values[p]!;
        if (value - value !== 0) continue;
        live++;
        if (probe.quantity === 'exceedance' ? value >= level : value <= level) count++;
      }
      return proportion(count, live, note);
    }
    case 'hit-before': {
      const level = requireLevel(probe);
      const { hit, live, watch } = hits(result, probe, level, probe.direction ?? 'above');
      let trials = 0;
      let successes = 0;
      for (let p = 0; p < result.paths; p++) {
        trials += live[p]!;
        successes += hit[p]!;
      }
      return { ...proportion(successes, trials, note), monitoring: monitoringText(result, watch) };
    }
    case 'first-passage':
      return firstPassage(result, probe);
    case 'extinction':
      return extinction(result, probe);
    case 'covariance':
      return covarianceEstimate(result, probe, note);
    case 'correlation':
      return correlationEstimate(result, probe, note);
  }
}
