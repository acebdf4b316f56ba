import { ref } from 'vue';
import { applyEstimates, revertEstimates, type ValueChange } from '@shared/fit/use-values';
import type { SheetDocumentState } from './document';
import type { SheetRunsState } from './runs';

/**
 * "Use these values" on a fit cell: its estimates go into the params cells through the document's
 * one `commit` (a draft is written, the cells that read them turn stale, the next version saves
 * them), and the page offers to undo that edit until the next one.
 */
export function useFitValues(state: SheetDocumentState, runs: SheetRunsState) {
  const lastValuesEdit = ref<{ fitCellId: string; changes: ValueChange[] } | null>(null);

  /** Returns the number of parameters changed (0 when the fit has no usable estimates). */
  function useFitEstimates(fitCellId: string): number {
    const doc = state.document.value;
    const output = runs.outputs.value[fitCellId];
    if (!doc || state.readonly.value || output?.kind !== 'fit' || !output.result.ok) return 0;
    const { doc: next, changes } = applyEstimates(doc, output.result.estimates);
    if (changes.length === 0) return 0;
    state.commit(next);
    lastValuesEdit.value = { fitCellId, changes };
    return changes.length;
  }

  function undoFitEstimates(): void {
    const edit = lastValuesEdit.value;
    const doc = state.document.value;
    lastValuesEdit.value = null;
    if (edit && doc) state.commit(revertEstimates(doc, edit.changes));
  }

  return { lastValuesEdit, useFitEstimates, undoFitEstimates };
}
