import { kindOf } from '@shared/cells/registry';
import type { SimulationPlan } from '@shared/engine/plan';
import type { StabilityReport } from '@shared/engine/result';
import type { SheetDocument, SimulationCell } from '@shared/sheet/document';
import { buildSimulationPlan } from '@shared/sheet/plan';
import { planRunSteps } from '@shared/run/steps';

/** A simulation whose step is unstable for its model, found before it runs. */
export interface UnstableStep {
  cellId: string;
  /** "Simulation 'Stiff decay'". */
  title: string;
  /** The engine's report in words (shared/engine/linear-stability.ts, stability.ts). */
  message: string;
  /** The largest stable step, when the engine knows it. */
  maxStableStep: number | null;
}

/** The simulations a run of `targetId` (null: the sheet) would compute rather than reuse. */
export function simulationsToCompute(
  doc: SheetDocument,
  targetId: string | null,
  dependencies: ReadonlyMap<string, string[]>,
  isCurrent: (cellId: string) => boolean,
): SimulationCell[] {
  const cells: SimulationCell[] = [];
  for (const step of planRunSteps(doc, targetId, dependencies)) {
    const cell = doc.cells.find((c) => c.id === step.cellId);
    if (cell?.kind !== 'simulation') continue;
    if (isCurrent(cell.id) && !step.force) continue;
    cells.push(cell);
  }
  return cells;
}

/**
 * The simulations whose step the engine finds unstable at the initial state although the model
 * itself is stable there (|1 + hλ| > 1 for Euler–Maruyama; Higham 2000 for the mean-square
 * condition): their numbers would grow without meaning, so the person is asked before the run.
 * A plan that cannot be built is left to the run, which reports why.
 */
export async function unstableSteps(
  doc: SheetDocument,
  cells: SimulationCell[],
  stability: (plan: SimulationPlan) => Promise<StabilityReport | null>,
): Promise<UnstableStep[]> {
  const found: UnstableStep[] = [];
  for (const cell of cells) {
    let plan: SimulationPlan;
    try {
      plan = buildSimulationPlan(doc, cell.id);
    } catch {
      continue;
    }
    const report = await stability(plan);
    if (!report || report.stable || !report.modelStable) continue;
    found.push({
      cellId: cell.id,
      title: `${kindOf(cell).label} '${kindOf(cell).title(cell)}'`,
      message: report.message,
      maxStableStep: report.maxStableStep,
    });
  }
  return found;
}
