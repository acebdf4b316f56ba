import type { RunStepContext } from '../cells/kind';
import type { SimulationPlan } from '../engine/plan';
import { evaluateProbe } from '../engine/probes';
import { influenceValues } from '../engine/paired-difference';
import type { ProbeEstimate, ProbeRequest, SimulationResult } from '../engine/result';
import { RunCancelledError } from './chunk-pool';

/**
 * Runs the points of a sweep or of a scenarios cell one after another through the run's executor
 * (the worker pool splits each point's paths), with progress over all of them ("point 7 of 20")
 * and a cancel checked between points (the executor's own cancel stops the point in flight).
 * Each point's full result is reduced at once to what the probes and charts need and dropped, so
 * memory grows with points × saved times, not with paths × points.
 */

/** A seed per point for independent runs: point 0 keeps the simulation's seed. */
export function independentSeed(seed: number, point: number): number {
  return (seed + Math.imul(point, 0x9e3779b9)) >>> 0;
}

export class PointRunner {
  private readonly started = performance.now();
  private pathsBefore = 0;
  private index = 0;

  /** `plannedPaths`: paths over every point the step may run (for the share done and time left). */
  constructor(
    private readonly context: RunStepContext,
    private count: number,
    private plannedPaths: number,
  ) {}

  /** One more point than planned (a refined run of a target search). */
  extend(points: number, paths: number): void {
    this.count += points;
    this.plannedPaths += paths;
  }

  async run(plan: SimulationPlan): Promise<SimulationResult> {
    if (this.context.isCancelled()) throw new RunCancelledError();
    this.index++;
    const index = Math.min(this.index, this.count);
    const result = await this.context.executor.runSimulation(plan, (progress) => {
      const pathsDone = this.pathsBefore + progress.pathsDone;
      const elapsedMs = performance.now() - this.started;
      this.context.onProgress({
        pathsDone,
        paths: this.plannedPaths,
        elapsedMs,
        etaMs: pathsDone > 0 ? (elapsedMs * Math.max(0, this.plannedPaths - pathsDone)) / pathsDone : null,
        point: {
          index,
          count: this.count,
          share: progress.paths > 0 ? progress.pathsDone / progress.paths : 0,
        },
      });
    });
    this.pathsBefore += plan.paths;
    return result;
  }
}

/** A probe's estimate at one point with its influence values (kept only while a difference needs them). */
export interface PointEstimate {
  estimate: ProbeEstimate | null;
  error: string | null;
  influence: Float64Array | null;
}

export function estimateAt(result: SimulationResult, request: ProbeRequest): PointEstimate {
  try {
    const estimate = evaluateProbe(result, request);
    return { estimate, error: null, influence: influenceValues(result, request, estimate) };
  } catch (error) {
    return {
      estimate: null,
      error: error instanceof Error ? error.message : String(error),
      influence: null,
    };
  }
}
