import { computed, ref } from 'vue';
import { estimateWork } from '@shared/engine/work';
import { issueInWords } from '@shared/sheet/issue-words';
import { stepCount } from '@shared/sheet/step-count';
import { kindOf } from '@shared/cells/registry';
import { manyPointWork } from '@shared/cells/many-points';
import { planRunSteps } from '@shared/run/steps';
import type { SheetDocumentState } from './document';
import type { SheetRunsState } from './runs';
import { simulationsToCompute } from './step-check';

export interface HeavyRunEstimate {
  cellId: string;
  /** "Simulation 'Twenty seasons'". */
  title: string;
  /** The engine's estimate in words (shared/engine/work.ts). */
  message: string;
}

/**
 * What stands between a click on "Run" and the run: a sheet with problems does not run (the
 * reason names cells by title and fields by label), and a run whose work is far beyond what a
 * browser finishes in minutes waits for a confirmation that has seen the estimate.
 */
export function useRunGuard(state: SheetDocumentState, runs: SheetRunsState) {
  const heavyRun = ref<{ targetId: string | null; estimates: HeavyRunEstimate[] } | null>(null);

  const runBlockedReason = computed<string | null>(() => {
    const doc = state.document.value;
    if (!doc) return null;
    const problems = [
      ...state.sheetIssues.value,
      ...doc.cells.flatMap((cell) =>
        (state.issues.value[cell.id] ?? []).map((issue) => issueInWords(doc, { cellId: cell.id, ...issue })),
      ),
    ];
    if (problems.length === 0) return null;
    const more = problems.length - 1;
    return `Fix the sheet before running. ${problems[0]}${more > 0 ? ` (and ${more} more problem${more === 1 ? '' : 's'})` : ''}`;
  });

  /** Simulations this run would compute (not reuse) whose work is beyond minutes. */
  function heavyEstimates(targetId: string | null): HeavyRunEstimate[] {
    const doc = state.document.value;
    if (!doc) return [];
    const estimates: HeavyRunEstimate[] = [];
    for (const cell of simulationsToCompute(doc, targetId, state.dependencies.value, runs.isCurrent)) {
      const model = doc.cells.find((c) => c.id === cell.model);
      const stateNames = model?.kind === 'model' ? model.states.map((s) => s.name) : [];
      const work = estimateWork({ paths: cell.paths, steps: stepCount(cell), model: { stateNames } });
      if (work.beyondMinutes && work.message) {
        estimates.push({
          cellId: cell.id,
          title: `${kindOf(cell).label} '${kindOf(cell).title(cell)}'`,
          message: work.message,
        });
      }
    }
    // Sweeps and scenarios run their simulation once per point.
    for (const step of planRunSteps(doc, targetId, state.dependencies.value)) {
      const cell = doc.cells.find((c) => c.id === step.cellId);
      if ((cell?.kind !== 'sweep' && cell?.kind !== 'scenarios') || (runs.isCurrent(cell.id) && !step.force))
        continue;
      const total = manyPointWork(doc, cell);
      if (!total) continue;
      const model = doc.cells.find((c) => c.id === total.simulation.model);
      const stateNames = model?.kind === 'model' ? model.states.map((s) => s.name) : [];
      const work = estimateWork({
        paths: total.paths,
        steps: stepCount(total.simulation),
        model: { stateNames },
      });
      if (work.beyondMinutes && work.message)
        estimates.push({
          cellId: cell.id,
          title: `${kindOf(cell).label} '${kindOf(cell).title(cell)}'`,
          message: `every point together: ${work.message}`,
        });
    }
    return estimates;
  }

  /** Runs the sheet (null) or one cell, unless the sheet has problems or the work needs a confirmation. */
  async function run(targetId: string | null, options: { confirmed?: boolean } = {}): Promise<void> {
    if (runBlockedReason.value !== null || runs.running.value) return;
    if (!options.confirmed) {
      const estimates = heavyEstimates(targetId);
      if (estimates.length > 0) {
        heavyRun.value = { targetId, estimates };
        return;
      }
    }
    await runs.run(targetId);
  }

  async function confirmHeavyRun(): Promise<void> {
    const pending = heavyRun.value;
    heavyRun.value = null;
    if (pending) await run(pending.targetId, { confirmed: true });
  }

  function cancelHeavyRun(): void {
    heavyRun.value = null;
  }

  return { runBlockedReason, heavyRun, run, confirmHeavyRun, cancelHeavyRun };
}
