import { computed, ref, shallowRef } from 'vue';
import type { Cell, CellKind, SheetDocument } from '@shared/sheet/document';
import type { CellIssue } from '@shared/sheet/issues';
import { mayDo, type SheetAction, type SheetRole } from '@shared/api/rights';
import * as cells from '@shared/sheet/cell-ops';
import { collectIssues, sheetCellDependencies, sheetFingerprints, stableStringify } from '@shared/sheet';

/**
 * The document being edited and every edit to it: cells added, changed, moved, duplicated,
 * deleted (with one undo), the checker's issues, dependencies and fingerprints. Every edit goes
 * through `commit`, which calls `onCommit` (the drafts piece writes the local draft there).
 */
export function useSheetDocument() {
  const sheetId = ref<string | null>(null);
  const userId = ref('anonymous');
  const document = ref<SheetDocument | null>(null);
  /** The server's document at the base version (or the old version being read). */
  const serverDocument = ref<SheetDocument | null>(null);
  /** The version the edits started from; a save names it. */
  const baseVersion = ref(0);
  /** The latest version the server reported. */
  const latestVersion = ref(0);
  /** Set while reading an older version (read-only). */
  const viewingVersion = ref<number | null>(null);
  /** The caller's role on the sheet; null until loaded. */
  const role = ref<SheetRole | null>(null);
  const issues = shallowRef<Record<string, CellIssue[]>>({});
  const sheetIssues = shallowRef<string[]>([]);
  const lastDeleted = ref<cells.RemovedCell | null>(null);
  let onCommit: (next: SheetDocument, dirty: boolean) => void = () => {};

  /** What the caller's role allows (the rights table, shared with the server). */
  const may = (action: SheetAction): boolean => mayDo(role.value, action);
  /** Cells cannot be edited: an old version is shown, or the role may not save versions. */
  const readonly = computed(() => viewingVersion.value !== null || !mayDo(role.value, 'saveVersion'));
  /** Any role may run the current version in its own browser; an old version is only read. */
  const canRun = computed(() => viewingVersion.value === null);
  const version = computed(() => viewingVersion.value ?? baseVersion.value);
  const dependencies = computed<Map<string, string[]>>(() => {
    if (!document.value) return new Map();
    try {
      return sheetCellDependencies(document.value);
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

  function resetDocument(): void {
    document.value = null;
    role.value = null;
    serverDocument.value = null;
    viewingVersion.value = null;
    issues.value = {};
    sheetIssues.value = [];
    lastDeleted.value = null;
  }

  function whenCommitted(listener: (next: SheetDocument, dirty: boolean) => void): void {
    onCommit = listener;
  }

  function commit(next: SheetDocument): void {
    if (readonly.value || !sheetId.value) return;
    document.value = next;
    onCommit(next, dirty.value);
  }

  function checkNow(): void {
    if (!document.value) return;
    const found = collectIssues(document.value);
    issues.value = found.byCell;
    sheetIssues.value = found.sheet;
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

  return {
    sheetId,
    userId,
    document,
    serverDocument,
    baseVersion,
    latestVersion,
    viewingVersion,
    version,
    role,
    may,
    canRun,
    issues,
    sheetIssues,
    lastDeleted,
    readonly,
    dependencies,
    fingerprints,
    dirty,
    resetDocument,
    whenCommitted,
    commit,
    checkNow,
    setTitle,
    updateCell,
    addCell,
    moveCell,
    duplicateCell,
    deleteCell,
    undoDelete,
  };
}

export type SheetDocumentState = ReturnType<typeof useSheetDocument>;
