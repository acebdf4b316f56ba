import { ref, type Ref } from 'vue';
import { diffSheets, type SheetDiff } from '@shared/sheet/diff';
import {
  compareRerun,
  simulationRecord,
  type RerunComparison,
  type SimulationRecord,
} from '@shared/run/compare';
import { cellOutputJson } from '@shared/run/output-json';
import type { SheetDocument } from '@shared/sheet/document';
import { forkSheet, getVersion, restoreVersion, type SheetDetail } from '@/api/sheets';
import { errorMessage } from '@/api/http';
import type { SheetDocumentState } from './document';
import type { SheetRunsState } from './runs';

export interface ShownComparison {
  /** "Version 2 → version 4", in words. */
  heading: string;
  diff: SheetDiff;
}

export interface RerunCheck {
  version: number;
  running: boolean;
  result: RerunComparison | null;
  error: string | null;
}

/**
 * History: the diff of two versions (or of a fork against its source), restoring an old version,
 * forking, and "rerun and compare": an old version's simulations run again on the page's worker
 * pool through the one orchestrator, their digests compared with the saved ones (shared/run/compare.ts).
 */
export function useSheetHistory(
  state: SheetDocumentState,
  runs: SheetRunsState,
  lineage: Ref<Pick<SheetDetail, 'forkSource'> | null>,
  reload: () => Promise<void>,
) {
  const comparison = ref<ShownComparison | null>(null);
  const historyError = ref<string | null>(null);
  const historyBusy = ref(false);
  const rerunCheck = ref<RerunCheck | null>(null);

  async function busy<T>(work: () => Promise<T>): Promise<T | null> {
    historyBusy.value = true;
    historyError.value = null;
    try {
      return await work();
    } catch (error) {
      historyError.value = errorMessage(error);
      return null;
    } finally {
      historyBusy.value = false;
    }
  }

  async function documentOf(number: number): Promise<SheetDocument> {
    return (await getVersion(state.sheetId.value!, number)).document;
  }

  async function compareVersions(before: number, after: number): Promise<void> {
    await busy(async () => {
      const [older, newer] = await Promise.all([documentOf(before), documentOf(after)]);
      const latest = after === state.latestVersion.value ? ' (current)' : '';
      comparison.value = {
        heading: `Version ${before} → version ${after}${latest}`,
        diff: diffSheets(older, newer),
      };
    });
  }

  const compareWithCurrent = (number: number) => compareVersions(number, state.latestVersion.value);
  const compareWithPrevious = (number: number) => compareVersions(number - 1, number);

  /** The fork as shown (unsaved edits included) against the version it was forked from. */
  async function compareWithSource(): Promise<void> {
    const source = lineage.value?.forkSource;
    const shown = state.document.value;
    if (!source?.canRead || !shown) return;
    await busy(async () => {
      const origin = await getVersion(source.sheetId, source.version);
      comparison.value = {
        heading: `${source.title}, version ${source.version} → this sheet`,
        diff: diffSheets(origin.document, shown),
      };
    });
  }

  /** Saves an old version as the new current one, then shows it. */
  async function restore(number: number): Promise<boolean> {
    const restored = await busy(() => restoreVersion(state.sheetId.value!, number));
    if (restored === null) return false;
    await reload();
    return true;
  }

  /** Forks the version shown; returns the new sheet's id (the page opens it). */
  async function fork(): Promise<string | null> {
    const version = state.viewingVersion.value ?? undefined;
    const created = await busy(() => forkSheet(state.sheetId.value!, version ? { version } : {}));
    return created?.id ?? null;
  }

  async function rerunAndCompare(number: number): Promise<void> {
    rerunCheck.value = { version: number, running: true, result: null, error: null };
    try {
      const saved = await getVersion(state.sheetId.value!, number);
      const run = await runs.runDocument(saved.document);
      if (run.cancelled) throw new Error('The rerun was cancelled.');
      const rerun: Record<string, SimulationRecord> = {};
      for (const [cellId, kept] of run.outputs) {
        if (kept.output.kind !== 'simulation') continue;
        const json = cellOutputJson(cellId, 'simulation', kept.output);
        if ('digest' in json) rerun[cellId] = simulationRecord(json);
      }
      const savedRecords: Record<string, SimulationRecord> = {};
      for (const [cellId, digest] of Object.entries(saved.digests)) {
        // The saved moments let a rerun under another engine version be compared within errors.
        const moments = Object.hasOwn(saved.moments, cellId) ? saved.moments[cellId] : undefined;
        savedRecords[cellId] = { digest, engineVersion: saved.engineVersion, ...moments };
      }
      rerunCheck.value = {
        version: number,
        running: false,
        result: compareRerun(savedRecords, rerun),
        error: null,
      };
    } catch (error) {
      rerunCheck.value = { version: number, running: false, result: null, error: errorMessage(error) };
    }
  }

  function closeComparison(): void {
    comparison.value = null;
  }

  function closeRerunCheck(): void {
    if (!rerunCheck.value?.running) rerunCheck.value = null;
  }

  function resetHistory(): void {
    comparison.value = null;
    historyError.value = null;
    rerunCheck.value = null;
  }

  return {
    comparison,
    historyError,
    historyBusy,
    rerunCheck,
    compareWithCurrent,
    compareWithPrevious,
    compareWithSource,
    restore,
    fork,
    rerunAndCompare,
    closeComparison,
    closeRerunCheck,
    resetHistory,
  };
}
