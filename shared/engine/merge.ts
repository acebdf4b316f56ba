import type { SimulationPlan } from './plan';
import type {
  ChunkResult,
  ExtinctionSummary,
  ProbeSeries,
  SavedStats,
  SimulationResult,
  BlowupSummary,
  LossSummary,
} from './result';
import { planLayout } from './layout';
import { moments, quantilesInPlace } from './statistics';
import { runDigest } from './run-digest';
import { lossSummary } from './losses';
import { savedCovariance } from './covariance';
import { stabilityReport } from './stability';

function checkChunks(plan: SimulationPlan, chunks: ChunkResult[], stateCount: number): void {
  if (chunks.length === 0) throw new RangeError('nothing to merge: no chunks were given');
  let expectedFirst = chunks[0]!.firstPath;
  for (const chunk of chunks) {
    if (
      chunk.stateCount !== stateCount ||
      chunk.saveCount !== plan.saveCount ||
      chunk.watchCount !== plan.watches.length ||
      chunk.probeCount !== plan.probeTimes.length
    ) {
      throw new RangeError('a chunk does not belong to this plan (its sizes differ)');
    }
    if (chunk.firstPath !== expectedFirst)
      throw new RangeError(
        `chunks must be given in path order without gaps; expected a chunk starting at path ${expectedFirst}, got ${chunk.firstPath}`,
      );
    expectedFirst = chunk.firstPath + chunk.pathCount;
  }
}

/** Copies column `column` (of `rows` rows of chunk.pathCount) of each chunk's done paths into one array. */
function gather<T extends Float64Array | Uint8Array>(
  chunks: ChunkResult[],
  pick: (chunk: ChunkResult) => T,
  column: number,
  paths: number,
  into?: T,
  at = 0,
): T {
  const out = into ?? new (pick(chunks[0]!).constructor as new (length: number) => T)(paths);
  let offset = at;
  for (const chunk of chunks) {
    const start = column * chunk.pathCount;
    out.set(pick(chunk).subarray(start, start + chunk.pathsDone), offset);
    offset += chunk.pathsDone;
  }
  return out;
}

/** Minimum, the five reported quantiles, maximum. */
const SAVED_PROBABILITIES = [0, 0.05, 0.25, 0.5, 0.75, 0.95, 1] as const;

function savedStats(
  values: Float64Array,
  paths: number,
  saveCount: number,
  scratch: Float64Array,
): SavedStats {
  const stats: SavedStats = {
    mean: new Float64Array(saveCount),
    variance: new Float64Array(saveCount),
    q05: new Float64Array(saveCount),
    q25: new Float64Array(saveCount),
    q50: new Float64Array(saveCount),
    q75: new Float64Array(saveCount),
    q95: new Float64Array(saveCount),
    min: new Float64Array(saveCount),
    max: new Float64Array(saveCount),
    live: new Int32Array(saveCount),
  };
  const levels = new Float64Array(SAVED_PROBABILITIES.length);
  for (let k = 0; k < saveCount; k++) {
    const column = values.subarray(k * paths, (k + 1) * paths);
    const m = moments(column);
    let count = 0;
    for (let p = 0; p < paths; p++) {
      const value = column[p]!;
      if (value - value === 0) scratch[count++] = value;
    }
    quantilesInPlace(scratch, count, SAVED_PROBABILITIES, levels);
    stats.mean[k] = m.mean;
    stats.variance[k] = m.variance;
    stats.min[k] = levels[0]!;
    stats.q05[k] = levels[1]!;
    stats.q25[k] = levels[2]!;
    stats.q50[k] = levels[3]!;
    stats.q75[k] = levels[4]!;
    stats.q95[k] = levels[5]!;
    stats.max[k] = levels[6]!;
    stats.live[k] = count;
  }
  return stats;
}

/** The older summary the page still reads: every loss counts, the message and advice as one suggestion. */
function blowupSummary(losses: LossSummary): BlowupSummary {
  if (losses.count === 0) return { count: 0, firstTime: null, suggestion: null };
  const advice = losses.advice.map((line) => `${line.charAt(0).toUpperCase()}${line.slice(1)}.`).join(' ');
  return { count: losses.count, firstTime: losses.firstTime, suggestion: `${losses.message} ${advice}` };
}

function extinctionSummaries(plan: SimulationPlan, absorptionTime: Float64Array[]): ExtinctionSummary[] {
  const summaries: ExtinctionSummary[] = [];
  plan.boundaries.forEach((rule, state) => {
    if (rule.rule !== 'absorb') return;
    const times = absorptionTime[state]!;
    let count = 0;
    let sum = 0;
    let firstTime = Infinity;
    for (let p = 0; p < times.length; p++) {
      const time = times[p]!;
      if (time === time) {
        count++;
        sum += time;
        if (time < firstTime) firstTime = time;
      }
    }
    summaries.push({
      state,
      count,
      firstTime: count > 0 ? firstTime : null,
      meanTime: count > 0 ? sum / count : null,
    });
  });
  return summaries;
}

/**
 * Merges chunks given in path order into the run's result. Statistics are computed over the
 * concatenated columns, so the result (and its digest) does not depend on how paths were
 * chunked. Lost paths (NaN) are left out of every statistic; `live` says how many remain, and
 * `losses` says why they were lost and whether the estimates are conditional on the survivors.
 */
export function mergeChunks(plan: SimulationPlan, chunks: ChunkResult[]): SimulationResult {
  const layout = planLayout(plan);
  const d = layout.stateCount;
  checkChunks(plan, chunks, d);
  const paths = chunks.reduce((sum, chunk) => sum + chunk.pathsDone, 0);
  const saveCount = plan.saveCount;

  const savedValues = Array.from({ length: d }, (_, i) => {
    const values = new Float64Array(saveCount * paths);
    for (let k = 0; k < saveCount; k++) gather(chunks, (c) => c.saved, k * d + i, paths, values, k * paths);
    return values;
  });
  const scratch = new Float64Array(paths);
  const stats = savedValues.map((values) => savedStats(values, paths, saveCount, scratch));
  const covariance = savedCovariance(savedValues, stats, paths, saveCount);
  const finalValues = savedValues.map((values) => values.slice((saveCount - 1) * paths, saveCount * paths));
  const sampleCount = Math.min(plan.samplePaths, paths);
  const samplePaths = savedValues.map((values) =>
    Array.from({ length: sampleCount }, (_, p) => {
      const path = new Float64Array(saveCount);
      for (let k = 0; k < saveCount; k++) path[k] = values[k * paths + p]!;
      return path;
    }),
  );
  const probes: ProbeSeries[] = plan.probeTimes.map((requested, j) => ({
    requested,
    time: layout.probeTimes[j]!,
    values: Array.from({ length: d }, (_, i) => gather(chunks, (c) => c.probeValues, j * d + i, paths)),
  }));
  const runningMax = Array.from({ length: d }, (_, i) => gather(chunks, (c) => c.runningMax, i, paths));
  const runningMin = Array.from({ length: d }, (_, i) => gather(chunks, (c) => c.runningMin, i, paths));
  const firstPassage = plan.watches.map((_, w) => gather(chunks, (c) => c.firstPassage, w, paths));
  const absorptionTime = Array.from({ length: d }, (_, i) =>
    gather(chunks, (c) => c.absorptionTime, i, paths),
  );
  const blowupTime = gather(chunks, (c) => c.blowupTime, 0, paths);
  const lossCause = gather(chunks, (c) => c.lossCause, 0, paths);
  const losses = lossSummary(plan, blowupTime, lossCause, layout.h);

  const digest = runDigest({
    paths,
    lostCount: losses.count,
    savedTimes: layout.savedTimes,
    stats,
    savedValues,
    covariance,
    probeValues: probes.map((probe) => probe.values),
    runningMax,
    runningMin,
    firstPassage,
    absorptionTime,
    lossTime: blowupTime,
    lossCause,
  });

  return {
    stateNames: [...plan.model.stateNames],
    method: plan.method,
    paths,
    cancelled: chunks.some((chunk) => chunk.cancelled),
    steps: plan.steps,
    h: layout.h,
    t0: plan.t0,
    t1: plan.t1,
    seed: plan.seed,
    savedTimes: layout.savedTimes,
    savedSteps: layout.saveSteps.slice(0, saveCount),
    stats,
    savedValues,
    covariance,
    samplePaths,
    finalValues,
    probes,
    runningMax,
    runningMin,
    watches: plan.watches.map((watch) => ({ ...watch })),
    watchLevels: layout.watchLevels,
    firstPassage,
    absorptionTime,
    blowupTime,
    lossCause,
    losses,
    blowups: blowupSummary(losses),
    extinctions: extinctionSummaries(plan, absorptionTime),
    stability: stabilityReport(plan, {
      savedTimes: layout.savedTimes,
      meanStates: stats.map((s) => s.mean),
    }),
    digest,
    kernel: chunks.some((chunk) => chunk.kernel === 'wasm') ? 'wasm' : 'js',
    ...(chunks.find((chunk) => chunk.kernelNote !== undefined)?.kernelNote === undefined
      ? {}
      : { kernelNote: chunks.find((chunk) => chunk.kernelNote !== undefined)!.kernelNote }),
  };
}
