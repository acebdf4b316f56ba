import { buildSimulationPlan, checkSheet, sheetCellDependencies } from '@shared/sheet';
import { evaluateProbe } from '@shared/engine/probes';
import type { SheetRunBackend } from './sheet-editor-run';

/**
 * Where the sheet page's runs happen: the browser's worker pool, loaded on the first run so a
 * page that only reads a sheet starts no workers. Nothing here compiles code on the main thread:
 * plans are plain data and probes are read from finished results.
 */
export async function createRunBackend(): Promise<SheetRunBackend> {
  const { SimulationPool } = await import('@/workers/pool');
  const pool = new SimulationPool();
  return {
    runSimulation: (plan, onProgress) => pool.simulate(plan, onProgress),
    runStudy: (plan, options) => pool.runStudy(plan, options),
    cancel: () => pool.cancel(),
  };
}

/** The pure functions of shared/ the editor store uses. */
export const sheetTools = { checkSheet, buildSimulationPlan, sheetCellDependencies, evaluateProbe };
