import type { SimulationCell } from '@shared/sheet/document';
import { NOMINAL_STATE_STEPS_PER_SECOND, estimateWork, type WorkEstimate } from '@shared/engine/work';
import { stepCount as sharedStepCount } from '@shared/sheet/step-count';

/**
 * A rough cost of a run, shown before it starts so nobody launches a day-long job by a typo. The
 * work and its rate come from the engine (shared/engine/work.ts), the steps from the same count
 * the plan uses (shared/sheet/step-count.ts): one home for both.
 */
/** Saved values are float64. */
const BYTES_PER_VALUE = 8;
export const MEMORY_WARNING_BYTES = 1e9;

export interface RunCost {
  steps: number;
  pathSteps: number;
  workers: number;
  /** Wall-clock seconds spread over the workers, at the engine's nominal rate. */
  seconds: number;
  /** Memory for the saved values of all paths: paths × saveCount × states × 8 bytes. */
  bytes: number;
  warning: string | null;
  /** The engine's estimate on one core (beyondMinutes asks for a confirmation before a run). */
  work: WorkEstimate;
}

/** Steps of a run, or null while neither a step count nor a usable step size is set. */
export function stepCount(cell: Pick<SimulationCell, 't0' | 't1' | 'steps' | 'stepSize'>): number | null {
  if (cell.steps !== undefined) return cell.steps;
  if (cell.stepSize !== undefined && cell.stepSize > 0 && cell.t1 > cell.t0) return sharedStepCount(cell);
  return null;
}

export function estimateRunCost(
  cell: SimulationCell,
  stateCount: number,
  hardwareConcurrency: number,
): RunCost | null {
  const steps = stepCount(cell);
  if (steps === null) return null;
  const states = Math.max(1, stateCount);
  const workers = Math.max(1, Math.floor(hardwareConcurrency) - 1);
  const work = estimateWork({
    paths: cell.paths,
    steps,
    model: { stateNames: Array.from({ length: states }, String) },
  });
  const seconds = (work.pathSteps * states) / (NOMINAL_STATE_STEPS_PER_SECOND * workers);
  const bytes = cell.paths * cell.saveCount * states * BYTES_PER_VALUE;
  const warning =
    bytes > MEMORY_WARNING_BYTES
      ? `The saved values need about ${formatBytes(bytes)}, more than a browser tab can comfortably hold: lower the paths or the saved times.`
      : null;
  return { steps, pathSteps: work.pathSteps, workers, seconds, bytes, warning, work };
}

export function formatBytes(bytes: number): string {
  const units = ['bytes', 'kB', 'MB', 'GB', 'TB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1000 && unit < units.length - 1) {
    value /= 1000;
    unit += 1;
  }
  return `${unit === 0 ? value : value.toPrecision(3)} ${units[unit]}`;
}

export function formatSeconds(seconds: number): string {
  if (seconds < 1) return 'under a second';
  if (seconds < 90) return `about ${Math.round(seconds)} s`;
  if (seconds < 5400) return `about ${Math.round(seconds / 60)} min`;
  return `about ${(seconds / 3600).toFixed(1)} h`;
}

export function formatCount(count: number): string {
  if (count < 1e6) return count.toLocaleString('en');
  if (count < 1e9) return `${(count / 1e6).toPrecision(3)} million`;
  return `${(count / 1e9).toPrecision(3)} billion`;
}
