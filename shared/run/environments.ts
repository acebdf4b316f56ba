import { mergeChunks } from '../engine/merge';
import { runStudy } from '../engine/study';
import type { SimulationPlan } from '../engine/plan';
import type { ChunkResult, StudyOptions, StudyResult } from '../engine/result';
import type { ChunkPool } from './chunk-pool';
import { runChunkTask } from './chunk-task';
import { splitPaths } from './chunks';
import type { RunExecutor } from '../cells/kind';
import { fitModel } from '../fit/fit-model';

/**
 * Ready-made executors for runSheet. Both use the same chunk split, so a sheet gives the same
 * digest in-process, on one worker or on many.
 */

/** Everything on the calling thread (tests, `--workers 0`-like debugging, small runs in Node). */
export function inProcessExecutor(): RunExecutor {
  return {
    async runSimulation(plan, onProgress) {
      const started = performance.now();
      const chunks: ChunkResult[] = [];
      let pathsDone = 0;
      for (const range of splitPaths(plan.paths, plan.steps)) {
        chunks.push(runChunkTask(plan, range.firstPath, range.pathCount, null));
        pathsDone += range.pathCount;
        const elapsedMs = performance.now() - started;
        onProgress?.({
          pathsDone,
          paths: plan.paths,
          elapsedMs,
          etaMs: (elapsedMs * (plan.paths - pathsDone)) / pathsDone,
        });
      }
      return mergeChunks(plan, chunks);
    },
    async runStudy(plan, options) {
      return runStudy(plan, options);
    },
    async runFit(problem, onProgress) {
      return fitModel(problem, { onProgress });
    },
  };
}

/** Simulations on a chunk pool (merged here, in path order); studies wherever the caller says. */
export function poolExecutor(
  pool: ChunkPool<SimulationPlan, ChunkResult>,
  study: (plan: SimulationPlan, options: StudyOptions) => Promise<StudyResult>,
): RunExecutor {
  return {
    async runSimulation(plan, onProgress) {
      return mergeChunks(plan, await pool.run(plan, onProgress));
    },
    runStudy: study,
  };
}
