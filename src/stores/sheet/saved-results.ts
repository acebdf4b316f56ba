import { kindOf } from '@shared/cells/registry';
import type { SheetDocument } from '@shared/sheet/document';
import { sheetCellDependencies } from '@shared/sheet/dependencies';
import { sheetFingerprints } from '@shared/sheet/fingerprint';
import { buildSimulationPlan } from '@shared/sheet/plan';
import { outputsFromResults, type VersionResults } from '@shared/run/version-results';
import type { SheetDocumentState } from './document';
import type { SheetRunsState } from './runs';

/**
 * Results that come back without a run: from the browser's cache of last results (shown as
 * current, since their inputs' fingerprints match) and from the summary saved with a version
 * (labelled "as saved with version N"). Loading a sheet asks for both, the cache first.
 */
export function useSavedResults(state: SheetDocumentState, runs: SheetRunsState) {
  /** Cached outputs for the cells of the document as it is now (after a restored draft). */
  async function restoreCached(sheetId: string): Promise<void> {
    const doc = state.document.value;
    if (!doc) return;
    const fingerprints = state.fingerprints.value;
    const cells = doc.cells.filter((cell) => kindOf(cell).run !== undefined && fingerprints[cell.id]);
    const found = await Promise.all(cells.map((cell) => runs.cache.get(fingerprints[cell.id]!)));
    // The person may have opened another sheet, or edited, while the cache answered.
    if (state.sheetId.value !== sheetId) return;
    cells.forEach((cell, i) => {
      const output = found[i];
      if (output && state.fingerprints.value[cell.id] === fingerprints[cell.id])
        runs.restore(cell.id, output, fingerprints[cell.id]!, null);
    });
  }

  /**
   * The results saved with version `version` of the sheet, on the cells that have no output
   * yet. Their fingerprints are those of the version's document, so a cell edited since (a
   * restored draft) shows them as stale.
   */
  function showSaved(
    doc: SheetDocument,
    results: VersionResults | null,
    version: number,
    savedAt: Date,
  ): void {
    if (!results) return;
    const fingerprints = sheetFingerprints(doc, sheetCellDependencies(doc));
    const planOf = (simulationId: string) => {
      try {
        return buildSimulationPlan(doc, simulationId);
      } catch {
        return null;
      }
    };
    for (const [cellId, output] of outputsFromResults(doc, results, planOf, savedAt)) {
      const fingerprint = fingerprints[cellId];
      if (fingerprint) runs.restore(cellId, output, fingerprint, version);
    }
  }

  return { restoreCached, showSaved };
}

export type SavedResultsState = ReturnType<typeof useSavedResults>;
