import type { SimulationCell } from '@shared/sheet/document';

/**
 * A rough cost of a run, shown before it starts so nobody launches a ten-minute job by a typo.
 * Throughput is a measured ballpark for Euler–Maruyama on a small model, not a promise.
 */
export const PATH_STEPS_PER_SECOND_PER_WORKER = 40e6;
/** Saved values are float64. */
const BYTES_PER_VALUE = 8;
export const MEMORY_WARNING_BYTES = 1e9;

export interface RunCost {
  steps: number;
  pathSteps: number;
  workers: number;
  seconds: number;
  /** Memory for the saved values of all paths: paths × saveCount × states × 8 bytes. */
  bytes: number;
  warning: string | null;
}

/** Steps of a run: given directly, or from the step size over [t0, t1] (rounded up). */
export function stepCount(cell: Pick<SimulationCell, 't0' | 't1' | 'steps' | 'stepSize'>): number | null {
  if (cell.steps !== undefined) return cell.steps;
  if (cell.stepSize !== undefined && cell.stepSize > 0 && cell.t1 > cell.t0)
    return Math.ceil((cell.t1 - cell.t0) / cell.stepSize - 1e-9);
  return null;
}

export function estimateRunCost(
  cell: SimulationCell,
  stateCount: number,
  hardwareConcurrency: number,
): RunCost | null {
  const steps = stepCount(cell);
  if (steps === null) return null;
  const workers = Math.max(1, Math.floor(hardwareConcurrency) - 1);
  const pathSteps = cell.paths * steps;
  const seconds = pathSteps / (PATH_STEPS_PER_SECOND_PER_WORKER * workers);
  const bytes = cell.paths * cell.saveCount * Math.max(1, stateCount) * BYTES_PER_VALUE;
  const warning =
    bytes > MEMORY_WARNING_BYTES
      ? `The saved values need about ${formatBytes(bytes)}, more than a browser tab can comfortably hold: lower the paths or the saved times.`
      : null;
  return { steps, pathSteps, workers, seconds, bytes, warning };
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
