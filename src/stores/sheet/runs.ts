import { computed, ref, shallowRef } from 'vue';
import { kindOf } from '@shared/cells/registry';
import type { SheetDocument } from '@shared/sheet/document';
import { currentRunRecords, runSheet, type KeptOutput, type SheetRun } from '@shared/run/run-sheet';
import { planRunSteps } from '@shared/run/steps';
import { summariseResults } from '@shared/run/version-results';
import type { CellOutput } from '@shared/run/outputs';
import type { RunProgress } from '@shared/run/progress';
import { errorMessage } from '@/api/http';
import { createBrowserDatasetProvider } from '@/api/datasets';
import { createBrowserExecutor, nextTask, type BrowserExecutor } from './browser-executor';
import type { SheetDocumentState } from './document';
import { createResultCache, type ResultCache } from './result-cache';
import { simulationsToCompute, unstableSteps, type UnstableStep } from './step-check';

/**
 * Runs of the sheet being edited, through the one orchestrator of shared/run: the outputs with
 * the fingerprints they were computed from, which cells are stale, progress and cancel. Nothing
 * here computes numbers: the orchestrator hands them to the worker pool.
 */
export function useSheetRuns(state: SheetDocumentState, cache: ResultCache = createResultCache()) {
  const outputs = shallowRef<Record<string, CellOutput | undefined>>({});
  /**
   * Cells showing the results saved with a version (by its number): shown, labelled, never
   * reused by a run, since a summary lacks the per-path values a probe or chart may need.
   */
  const savedWith = shallowRef<Record<string, number>>({});
  const outputFingerprints = shallowRef<Record<string, string>>({});
  const running = ref(false);
  const runningCellId = ref<string | null>(null);
  const progress = ref<RunProgress | null>(null);
  /** When the running step started (performance.now()), for elapsed time where no progress comes. */
  const stepStartedAt = ref<number | null>(null);
  const runNotice = ref<string | null>(null);
  /** Why the last run of a cell failed, when an earlier result was kept in its place. */
  const failures = shallowRef<Record<string, string>>({});
  let runCancelled = false;
  let executor: BrowserExecutor | null = null;
  const datasets = createBrowserDatasetProvider();
  /** True from a run's click until it shows as running (see run). */
  let starting = false;

  /** The cell's shown output was computed here from its inputs as they are now. */
  const isCurrent = (cellId: string): boolean =>
    outputFingerprints.value[cellId] === state.fingerprints.value[cellId] &&
    failures.value[cellId] === undefined &&
    savedWith.value[cellId] === undefined;
  /** A run held back because a step is unstable, until the person chooses (see UnstableStepDialog). */
  const unstableRun = ref<{ targetId: string | null; steps: UnstableStep[] } | null>(null);

  const kept = (cellId: string): KeptOutput | undefined => {
    // A result kept after a failed run is shown, never reused as current; nor is a saved summary.
    if (failures.value[cellId] !== undefined || savedWith.value[cellId] !== undefined) return undefined;
    const output = outputs.value[cellId];
    return output ? { output, fingerprint: outputFingerprints.value[cellId] ?? '' } : undefined;
  };

  /** Ids of cells whose output (or the output they show, for a chart) predates their inputs. */
  const staleCellIds = computed(() => {
    const stale = new Set<string>();
    for (const cell of state.document.value?.cells ?? []) {
      const sourceId = kindOf(cell).showsOutputOf?.(cell) ?? cell.id;
      const fingerprint = outputFingerprints.value[sourceId];
      if (fingerprint !== undefined && fingerprint !== state.fingerprints.value[sourceId]) stale.add(cell.id);
      if (failures.value[sourceId] !== undefined) stale.add(cell.id);
    }
    return stale;
  });

  function resetOutputs(): void {
    outputs.value = {};
    outputFingerprints.value = {};
    failures.value = {};
    savedWith.value = {};
    runNotice.value = null;
  }

  /**
   * Shows an output that was not computed by this page: one from the browser's cache (current
   * when its fingerprint matches) or one saved with a version. A cell that has an output already
   * keeps it.
   */
  function restore(cellId: string, output: CellOutput, fingerprint: string, version: number | null): void {
    if (outputs.value[cellId] !== undefined) return;
    outputs.value = { ...outputs.value, [cellId]: output };
    outputFingerprints.value = { ...outputFingerprints.value, [cellId]: fingerprint };
    if (version !== null) savedWith.value = { ...savedWith.value, [cellId]: version };
  }

  /**
   * A new output for a cell. A failure does not wipe an earlier result: the result stays (shown
   * as stale) beside the failure, so a bad edit or a worker that died loses nothing.
   */
  function record(cellId: string, output: CellOutput, fingerprint: string): void {
    const previous = outputs.value[cellId];
    if (output.kind === 'error' && previous !== undefined && previous.kind !== 'error') {
      failures.value = { ...failures.value, [cellId]: output.message };
      return;
    }
    if (failures.value[cellId] !== undefined) {
      const { [cellId]: _cleared, ...rest } = failures.value;
      failures.value = rest;
    }
    if (savedWith.value[cellId] !== undefined) {
      const { [cellId]: _replaced, ...rest } = savedWith.value;
      savedWith.value = rest;
    }
    outputs.value = { ...outputs.value, [cellId]: output };
    outputFingerprints.value = { ...outputFingerprints.value, [cellId]: fingerprint };
    void cache.put(fingerprint, output);
  }

  /** Runs the sheet (null) or one cell; unless `stepsConfirmed`, an unstable step holds it back first. */
  async function run(targetId: string | null, options: { stepsConfirmed?: boolean } = {}): Promise<void> {
    if (running.value || starting || !state.document.value || !state.canRun.value) return;
    // A plain deep copy: edits made while the run goes on do not leak into it, and the plans built
    // from it hold no reactive proxies (which cannot be posted to a worker).
    const doc = JSON.parse(JSON.stringify(state.document.value)) as SheetDocument;
    if (planRunSteps(doc, targetId, state.dependencies.value).length === 0) {
      runNotice.value =
        targetId === null
          ? 'Nothing to run: the sheet has no simulation, probe or study.'
          : 'Nothing to run for this cell.';
      return;
    }
    // Three short tasks instead of one long one: the click itself (the button's press effect
    // measures the page), then the page showing the run as started, then plans and workers.
    starting = true;
    await nextTask();
    starting = false;
    running.value = true;
    runNotice.value = null;
    runCancelled = false;
    try {
      await nextTask();
      if (!executor) {
        // The first run of the page loads the pool's code: its own task, before plans are built.
        executor = await createBrowserExecutor();
        await nextTask();
      }
      if (!options.stepsConfirmed) {
        const toCompute = simulationsToCompute(doc, targetId, state.dependencies.value, isCurrent);
        const steps = await unstableSteps(doc, toCompute, (plan) => executor!.stabilityBeforeRun(plan));
        if (steps.length > 0) {
          unstableRun.value = { targetId, steps };
          return;
        }
      }
      const result = await runSheet(doc, {
        executor,
        datasets,
        target: targetId,
        fingerprints: state.fingerprints.value,
        kept,
        onStepStart: (step) => {
          runningCellId.value = step.cellId;
          progress.value = null;
          stepStartedAt.value = performance.now();
        },
        onProgress: (_cellId, next) => {
          progress.value = next;
        },
        onCellOutput: (cellId, { output, fingerprint }) => record(cellId, output, fingerprint),
        isCancelled: () => runCancelled,
      });
      if (result.cancelled) runNotice.value = 'Run cancelled. Results finished before the cancel are kept.';
    } catch (error) {
      runNotice.value = `The run could not start: ${errorMessage(error)}`;
    } finally {
      running.value = false;
      runningCellId.value = null;
      progress.value = null;
      stepStartedAt.value = null;
    }
  }

  /**
   * Runs a whole document (an old version, for "rerun and compare") on the page's worker pool,
   * through the same orchestrator, without touching the outputs shown on the cells.
   */
  async function runDocument(doc: SheetDocument): Promise<SheetRun> {
    if (running.value || starting) throw new Error('A run is going on: wait for it to finish or cancel it.');
    running.value = true;
    runCancelled = false;
    try {
      await nextTask();
      if (!executor) executor = await createBrowserExecutor();
      const copy = JSON.parse(JSON.stringify(doc)) as SheetDocument;
      return await runSheet(copy, {
        executor,
        datasets,
        onStepStart: (step) => {
          runningCellId.value = step.cellId;
          stepStartedAt.value = performance.now();
        },
        onProgress: (_cellId, next) => {
          progress.value = next;
        },
        isCancelled: () => runCancelled,
      });
    } finally {
      running.value = false;
      runningCellId.value = null;
      progress.value = null;
      stepStartedAt.value = null;
    }
  }

  async function confirmUnstableRun(): Promise<void> {
    const pending = unstableRun.value;
    unstableRun.value = null;
    if (pending) await run(pending.targetId, { stepsConfirmed: true });
  }

  function dismissUnstableRun(): void {
    unstableRun.value = null;
  }

  function cancelRun(): void {
    if (!running.value) return;
    runCancelled = true;
    executor?.cancel();
  }

  function dismissRunNotice(): void {
    runNotice.value = null;
  }

  /**
   * Digests, final moments and the results summary of the outputs that match the document as it
   * is now, for saving a version. Results shown from an earlier version's summary count: they
   * stand for the same inputs, so a save that changed nothing they read carries them on.
   */
  function runRecordsNow(doc: SheetDocument) {
    const shown = (cellId: string): KeptOutput | undefined => {
      const output = outputs.value[cellId];
      if (!output || failures.value[cellId] !== undefined) return undefined;
      return { output, fingerprint: outputFingerprints.value[cellId] ?? '' };
    };
    return {
      ...currentRunRecords(doc, shown, state.fingerprints.value),
      results: summariseResults(doc, shown, state.fingerprints.value),
    };
  }

  return {
    outputs,
    outputFingerprints,
    running,
    runningCellId,
    progress,
    stepStartedAt,
    runNotice,
    failures,
    savedWith,
    staleCellIds,
    record,
    restore,
    cache,
    isCurrent,
    unstableRun,
    confirmUnstableRun,
    dismissUnstableRun,
    resetOutputs,
    run,
    runDocument,
    cancelRun,
    dismissRunNotice,
    runRecordsNow,
  };
}

export type SheetRunsState = ReturnType<typeof useSheetRuns>;
