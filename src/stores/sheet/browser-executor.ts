import type { RunExecutor } from '@shared/cells/kind';

/** The browser's executor: the worker pool, loaded on the first run so a page that only reads starts none. */
export interface BrowserExecutor extends RunExecutor {
  cancel(): void;
}

export async function createBrowserExecutor(): Promise<BrowserExecutor> {
  const { SimulationPool } = await import('@/workers/pool');
  const pool = new SimulationPool();
  return {
    runSimulation: (plan, onProgress) => pool.simulate(plan, onProgress),
    runStudy: (plan, options) => pool.runStudy(plan, options),
    cancel: () => pool.cancel(),
  };
}

/** Resolves in a later task, letting the browser handle input and paint in between. */
export function nextTask(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}
