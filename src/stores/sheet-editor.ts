import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import type { Cell, CellKind, SheetDocument } from '@shared/sheet/document';
import type { CellIssue, CellOutput } from '@/components/cells/contract';
import { createSheet, getSheet, getVersion, renameSheet, saveVersion, versionConflict } from '@/api/sheets';
import { errorMessage } from '@/api/http';
import { sheetFingerprints, stableStringify } from './sheet-editor-fingerprint';
import * as cells from './sheet-editor-cells';
import { clearDraft, readDraft, writeDraft, type SheetDraft } from './sheet-editor-drafts';
import { collectIssues } from './sheet-editor-issues';
import {
  currentDigests,
  executeRunSteps,
  planRunSteps,
  type RunProgress,
  type SheetRunBackend,
} from './sheet-editor-run';
import { createRunBackend, sheetTools } from './sheet-editor-backend';

/**
 * The sheet being edited: its document, the version it is based on, the outputs of runs with the
 * fingerprints they were computed from, the checker's issues, the local draft and the save flow.
 * Components read it with storeToRefs and call its actions; the pure work lives in the
 * sheet-editor-* modules beside it.
 */
/** Resolves in a later task, letting the browser handle input and paint in between. */
function nextTask(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

export const useSheetEditorStore = defineStore('sheet-editor', () => {
  const sheetId = ref<string | null>(null);
  const userId = ref('anonymous');
  const document = ref<SheetDocument | null>(null);
  /** The server's document at `baseVersion` (or the old version being read). */
  const serverDocument = ref<SheetDocument | null>(null);
  const serverTitle = ref('');
  const serverUpdatedAt = ref<Date | null>(null);
  const owner = ref<{ id: string; name: string } | null>(null);
  /** The version the edits started from; a save names it. */
  const baseVersion = ref(0);
  /** The latest version the server reported. */
  const latestVersion = ref(0);
  /** Set while reading an older version (read-only). */
  const viewingVersion = ref<number | null>(null);
  const loading = ref(false);
  const loadError = ref<string | null>(null);

  const outputs = shallowRef<Record<string, CellOutput | undefined>>({});
  const outputFingerprints = shallowRef<Record<string, string>>({});
  const issues = shallowRef<Record<string, CellIssue[]>>({});
  const sheetIssues = shallowRef<string[]>([]);

  const running = ref(false);
  const runningCellId = ref<string | null>(null);
  const progress = ref<RunProgress | null>(null);
  /** When the running step started (performance.now()), for elapsed time where no progress comes. */
  const stepStartedAt = ref<number | null>(null);
  const runNotice = ref<string | null>(null);
  let runCancelled = false;
  let backend: SheetRunBackend | null = null;

  const draftRestoredAt = ref<Date | null>(null);
  const draftStorageFailed = ref(false);
  const recovery = ref<SheetDraft | null>(null);
  const conflict = ref<{ currentVersion: number } | null>(null);
  const lastDeleted = ref<cells.RemovedCell | null>(null);
  const saving = ref(false);
  const saveError = ref<string | null>(null);

  const readonly = computed(() => viewingVersion.value !== null);
  const version = computed(() => viewingVersion.value ?? baseVersion.value);
  const dependencies = computed<Map<string, string[]>>(() => {
    if (!document.value) return new Map();
    try {
      return sheetTools.sheetCellDependencies(document.value);
    } catch {
      return new Map();
    }
  });
  const fingerprints = computed(() =>
    document.value ? sheetFingerprints(document.value, dependencies.value) : {},
  );
  const dirty = computed(
    () =>
      !readonly.value &&
      document.value !== null &&
      stableStringify(document.value) !== stableStringify(serverDocument.value),
  );

  /** Ids of cells whose output (or, for a chart, whose simulation's output) predates their inputs. */
  const staleCellIds = computed(() => {
    const stale = new Set<string>();
    for (const cell of document.value?.cells ?? []) {
      const sourceId = cell.kind === 'chart' ? cell.simulation : cell.id;
      const kept = outputFingerprints.value[sourceId];
      if (kept !== undefined && kept !== fingerprints.value[sourceId]) stale.add(cell.id);
    }
    return stale;
  });

  function reset(): void {
    document.value = null;
    serverDocument.value = null;
    viewingVersion.value = null;
    outputs.value = {};
    outputFingerprints.value = {};
    issues.value = {};
    sheetIssues.value = [];
    draftRestoredAt.value = null;
    recovery.value = null;
    conflict.value = null;
    lastDeleted.value = null;
    saveError.value = null;
    loadError.value = null;
    runNotice.value = null;
  }

  /**
   * Loads a sheet (or one of its older versions, read-only). A local draft that is newer than the
   * server's version is restored; a draft that the server has moved past is kept as a recovery
   * copy instead, so it is neither lost nor silently applied on top of someone else's version.
   */
  async function load(id: string, options: { userId: string; version?: number | null }): Promise<void> {
    if (running.value) cancelRun();
    reset();
    sheetId.value = id;
    userId.value = options.userId;
    loading.value = true;
    try {
      const sheet = await getSheet(id);
      if (sheetId.value !== id) return;
      serverTitle.value = sheet.title;
      serverUpdatedAt.value = sheet.updatedAt;
      owner.value = sheet.owner;
      latestVersion.value = sheet.version;
      baseVersion.value = sheet.version;
      if (options.version != null && options.version !== sheet.version) {
        const old = await getVersion(id, options.version);
        viewingVersion.value = old.number;
        serverDocument.value = old.document;
        document.value = old.document;
      } else {
        serverDocument.value = sheet.document;
        document.value = sheet.document;
        restoreDraft(sheet.version, sheet.updatedAt);
      }
      recovery.value = readDraft('recovery', userId.value, id);
      checkNow();
    } catch (error) {
      loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  function restoreDraft(serverVersion: number, serverUpdatedAt: Date): void {
    const id = sheetId.value!;
    const draft = readDraft('draft', userId.value, id);
    if (!draft) return;
    if (stableStringify(draft.document) === stableStringify(serverDocument.value)) {
      clearDraft('draft', userId.value, id);
      return;
    }
    if (draft.baseVersion >= serverVersion || draft.savedAt > serverUpdatedAt) {
      document.value = draft.document;
      baseVersion.value = Math.min(draft.baseVersion, serverVersion);
      draftRestoredAt.value = draft.savedAt;
      return;
    }
    writeDraft('recovery', userId.value, id, draft);
    clearDraft('draft', userId.value, id);
  }

  /** Every edit goes through here: the document changes and the local draft is written at once. */
  function commit(next: SheetDocument): void {
    if (readonly.value || !sheetId.value) return;
    document.value = next;
    if (dirty.value) {
      const written = writeDraft('draft', userId.value, sheetId.value, {
        document: next,
        baseVersion: baseVersion.value,
        savedAt: new Date(),
      });
      draftStorageFailed.value = !written;
    } else {
      clearDraft('draft', userId.value, sheetId.value);
    }
  }

  function setTitle(title: string): void {
    if (document.value) commit({ ...document.value, title });
  }

  function updateCell(cell: Cell): void {
    if (document.value) commit(cells.replaceCell(document.value, cell));
  }

  /** Inserts a default cell of `kind` at `index`; returns its id, or null when it cannot be added yet. */
  function addCell(kind: CellKind, index: number): string | null {
    const doc = document.value;
    if (!doc || cells.cannotAddReason(doc, kind, index)) return null;
    const cell = cells.defaultCell(kind, doc, index);
    commit(cells.insertCell(doc, index, cell));
    return cell.id;
  }

  function moveCell(cellId: string, delta: number): void {
    if (document.value) commit(cells.moveCell(document.value, cellId, delta));
  }

  function duplicateCell(cellId: string): string | null {
    if (!document.value) return null;
    const { doc, copy } = cells.duplicateCell(document.value, cellId);
    commit(doc);
    return copy?.id ?? null;
  }

  function deleteCell(cellId: string): void {
    if (!document.value) return;
    const { doc, removed } = cells.removeCell(document.value, cellId);
    if (!removed) return;
    lastDeleted.value = removed;
    commit(doc);
  }

  function undoDelete(): string | null {
    const removed = lastDeleted.value;
    if (!removed || !document.value) return null;
    lastDeleted.value = null;
    // A cell added since with the same id would clash: keep both by giving the restored one a new id.
    const clash = document.value.cells.some((cell) => cell.id === removed.cell.id);
    const cell = clash
      ? ({ ...removed.cell, id: cells.newCellId(removed.cell.kind, document.value) } as Cell)
      : removed.cell;
    commit(cells.insertCell(document.value, removed.index, cell));
    return cell.id;
  }

  function checkNow(): void {
    if (!document.value) return;
    const found = collectIssues(document.value, (doc) => sheetTools.checkSheet(doc));
    issues.value = found.byCell;
    sheetIssues.value = found.sheet;
  }

  /** True from a run's click until it shows as running (see run). */
  let starting = false;

  async function run(targetId: string | null): Promise<void> {
    if (running.value || starting || !document.value || readonly.value) return;
    // A plain deep copy: edits made while the run goes on do not leak into it, and the plans built
    // from it hold no reactive proxies (which cannot be posted to a worker).
    const doc = JSON.parse(JSON.stringify(document.value)) as SheetDocument;
    const steps = planRunSteps(doc, targetId, dependencies.value);
    if (steps.length === 0) {
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
      if (!backend) {
        // The first run of the page loads the pool's code: its own task, before plans are built.
        backend = await createRunBackend();
        await nextTask();
      }
      const finished = await executeRunSteps(steps, {
        doc,
        fingerprints: fingerprints.value,
        backend,
        tools: sheetTools,
        outputOf: (id) => {
          const output = outputs.value[id];
          return output ? { output, fingerprint: outputFingerprints.value[id] ?? '' } : undefined;
        },
        setOutput: (id, output, fingerprint) => {
          outputs.value = { ...outputs.value, [id]: output };
          outputFingerprints.value = { ...outputFingerprints.value, [id]: fingerprint };
        },
        onStepStart: (step) => {
          runningCellId.value = step.cellId;
          progress.value = null;
          stepStartedAt.value = performance.now();
        },
        onProgress: (_cellId, next) => {
          progress.value = next;
        },
        isCancelled: () => runCancelled,
      });
      if (!finished) runNotice.value = 'Run cancelled. Results finished before the cancel are kept.';
    } catch (error) {
      runNotice.value = `The run could not start: ${errorMessage(error)}`;
    } finally {
      running.value = false;
      runningCellId.value = null;
      progress.value = null;
      stepStartedAt.value = null;
    }
  }

  function cancelRun(): void {
    if (!running.value) return;
    runCancelled = true;
    backend?.cancel();
  }

  function dismissRunNotice(): void {
    runNotice.value = null;
  }

  /** Saves a version against the draft's base; a 409 opens the conflict choice instead. */
  async function save(message: string): Promise<boolean> {
    const doc = document.value;
    const id = sheetId.value;
    if (!doc || !id || readonly.value || saving.value) return false;
    saving.value = true;
    saveError.value = null;
    try {
      const digests = currentDigests(doc, outputs.value, outputFingerprints.value, fingerprints.value);
      const saved = await saveVersion(id, {
        baseVersion: baseVersion.value,
        message,
        document: doc,
        digests,
      });
      baseVersion.value = saved.number;
      latestVersion.value = Math.max(latestVersion.value, saved.number);
      serverDocument.value = doc;
      serverUpdatedAt.value = new Date();
      clearDraft('draft', userId.value, id);
      draftRestoredAt.value = null;
      if (doc.title.trim() !== serverTitle.value) await renameAfterSave(id, doc.title.trim());
      return true;
    } catch (error) {
      const current = versionConflict(error);
      if (current !== null) conflict.value = { currentVersion: current };
      else saveError.value = errorMessage(error);
      return false;
    } finally {
      saving.value = false;
    }
  }

  /** The sheet list shows the sheet's own title: keep it in step with the saved document's. */
  async function renameAfterSave(id: string, title: string): Promise<void> {
    try {
      await renameSheet(id, title);
      serverTitle.value = title;
    } catch (error) {
      saveError.value = `The version was saved, but the sheet list still shows the old title: ${errorMessage(error)}`;
    }
  }

  /** After a conflict: keep mine as a recovery copy, then load the version that won. */
  async function loadTheirVersion(): Promise<void> {
    const id = sheetId.value;
    const doc = document.value;
    if (!id || !doc) return;
    const mine: SheetDraft = { document: doc, baseVersion: baseVersion.value, savedAt: new Date() };
    const kept = writeDraft('recovery', userId.value, id, mine);
    clearDraft('draft', userId.value, id);
    await load(id, { userId: userId.value });
    if (!kept || !recovery.value) recovery.value = mine;
  }

  /** After a conflict: put my document in a new sheet; returns its id (the page navigates). */
  async function saveMineAsNewSheet(): Promise<string | null> {
    const id = sheetId.value;
    const doc = document.value;
    if (!id || !doc) return null;
    saveError.value = null;
    try {
      const title = `${doc.title.trim()} (my copy)`.slice(0, 200);
      const created = await createSheet({ title, document: { ...doc, title } });
      clearDraft('draft', userId.value, id);
      conflict.value = null;
      return created.id;
    } catch (error) {
      saveError.value = errorMessage(error);
      return null;
    }
  }

  function dismissConflict(): void {
    conflict.value = null;
  }

  function discardDraft(): void {
    const id = sheetId.value;
    if (!id || !serverDocument.value) return;
    clearDraft('draft', userId.value, id);
    document.value = serverDocument.value;
    baseVersion.value = latestVersion.value;
    draftRestoredAt.value = null;
    checkNow();
  }

  function dismissDraftNotice(): void {
    draftRestoredAt.value = null;
  }

  /** Puts the recovery copy back as the document being edited, on top of the current version. */
  function restoreRecovery(): void {
    const id = sheetId.value;
    const copy = recovery.value;
    if (!id || !copy || readonly.value) return;
    recovery.value = null;
    clearDraft('recovery', userId.value, id);
    commit(copy.document);
    checkNow();
  }

  function discardRecovery(): void {
    if (!sheetId.value) return;
    clearDraft('recovery', userId.value, sheetId.value);
    recovery.value = null;
  }

  return {
    sheetId,
    userId,
    document,
    serverDocument,
    serverTitle,
    serverUpdatedAt,
    owner,
    baseVersion,
    latestVersion,
    viewingVersion,
    loading,
    loadError,
    outputs,
    outputFingerprints,
    issues,
    sheetIssues,
    running,
    runningCellId,
    progress,
    stepStartedAt,
    runNotice,
    draftRestoredAt,
    draftStorageFailed,
    recovery,
    conflict,
    lastDeleted,
    saving,
    saveError,
    readonly,
    version,
    dependencies,
    fingerprints,
    dirty,
    staleCellIds,
    load,
    setTitle,
    updateCell,
    addCell,
    moveCell,
    duplicateCell,
    deleteCell,
    undoDelete,
    checkNow,
    run,
    cancelRun,
    dismissRunNotice,
    save,
    loadTheirVersion,
    saveMineAsNewSheet,
    dismissConflict,
    discardDraft,
    dismissDraftNotice,
    restoreRecovery,
    discardRecovery,
  };
});
