import type { RunExecutor } from '@shared/cells/kind';
import type { SimulationPlan } from '@shared/engine/plan';
import type { StabilityReport } from '@shared/engine/result';

/** The browser's executor: the worker pool, loaded on the first run so a page that only reads starts none. */
export interface BrowserExecutor extends RunExecutor {
  cancel(): void;
  /** The step's stability at the initial state, checked before a run. */
  stabilityBeforeRun(plan: SimulationPlan): Promise<StabilityReport | null>;
}

export async function createBrowserExecutor(): Promise<BrowserExecutor> {
  const { SimulationPool } = await import('@/workers/pool');
  const pool = new SimulationPool();
  return {
    runSimulation: (plan, onProgress) => pool.simulate(plan, onProgress),
    runStudy: (plan, options) => pool.runStudy(plan, options),
    runFit: (problem, onProgress) => pool.runFit(problem, onProgress),
    cancel: () => pool.cancel(),
    stabilityBeforeRun: (plan) => pool.stabilityBeforeRun(plan),
  };
}

/** Resolves in a later task, letting the browser handle input and paint in between. */
export function nextTask(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}
