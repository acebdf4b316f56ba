import { ref } from 'vue';
import { stableStringify } from '@shared/sheet';
import type { SheetDocument } from '@shared/sheet/document';
import type { SheetDocumentState } from './document';
import { clearDraft, readDraft, writeDraft, type SheetDraft } from './draft-storage';

/**
 * The local draft of the sheet being edited (written on every edit) and the recovery copy kept
 * when someone else's version replaced yours. A draft newer than the server's version is restored
 * on load; one the server has moved past becomes the recovery copy, neither lost nor silently
 * applied on top of someone else's version.
 */
export function useSheetDrafts(state: SheetDocumentState) {
  const draftRestoredAt = ref<Date | null>(null);
  const draftStorageFailed = ref(false);
  const recovery = ref<SheetDraft | null>(null);

  state.whenCommitted((next, dirty) => {
    const id = state.sheetId.value!;
    if (dirty) {
      const written = writeDraft('draft', state.userId.value, id, {
        document: next,
        baseVersion: state.baseVersion.value,
        savedAt: new Date(),
      });
      draftStorageFailed.value = !written;
    } else {
      clearDraft('draft', state.userId.value, id);
    }
  });

  function resetDrafts(): void {
    draftRestoredAt.value = null;
    recovery.value = null;
  }

  /**
   * After loading the server's current version: put back a draft based on that version; a draft
   * based on an older one is kept aside and offered (compare, keep on top, discard), never applied,
   * whatever the clocks say about when it was written.
   */
  function restoreDraft(serverVersion: number): void {
    const id = state.sheetId.value!;
    const user = state.userId.value;
    const draft = readDraft('draft', user, id);
    if (!draft) return;
    if (stableStringify(draft.document) === stableStringify(state.serverDocument.value)) {
      clearDraft('draft', user, id);
      return;
    }
    if (draft.baseVersion >= serverVersion) {
      state.document.value = draft.document;
      state.baseVersion.value = Math.min(draft.baseVersion, serverVersion);
      draftRestoredAt.value = draft.savedAt;
      return;
    }
    writeDraft('recovery', user, id, draft);
    clearDraft('draft', user, id);
  }

  function readRecovery(): void {
    if (state.sheetId.value) recovery.value = readDraft('recovery', state.userId.value, state.sheetId.value);
  }

  /** The draft was saved as a version, or put in a new sheet: it is no longer a draft. */
  function draftSettled(): void {
    if (state.sheetId.value) clearDraft('draft', state.userId.value, state.sheetId.value);
    draftRestoredAt.value = null;
  }

  /** Keeps a document as the recovery copy; returns false when the browser refused to store it. */
  function keepAsRecovery(document: SheetDocument): boolean {
    const id = state.sheetId.value!;
    const mine: SheetDraft = { document, baseVersion: state.baseVersion.value, savedAt: new Date() };
    const kept = writeDraft('recovery', state.userId.value, id, mine);
    clearDraft('draft', state.userId.value, id);
    return kept;
  }

  function discardDraft(): void {
    const id = state.sheetId.value;
    if (!id || !state.serverDocument.value) return;
    clearDraft('draft', state.userId.value, id);
    state.document.value = state.serverDocument.value;
    state.baseVersion.value = state.latestVersion.value;
    draftRestoredAt.value = null;
    state.checkNow();
  }

  function dismissDraftNotice(): void {
    draftRestoredAt.value = null;
  }

  /** Puts the recovery copy back as the document being edited, on top of the current version. */
  function restoreRecovery(): void {
    const id = state.sheetId.value;
    const copy = recovery.value;
    if (!id || !copy || state.readonly.value) return;
    recovery.value = null;
    clearDraft('recovery', state.userId.value, id);
    state.commit(copy.document);
    state.checkNow();
  }

  function discardRecovery(): void {
    if (!state.sheetId.value) return;
    clearDraft('recovery', state.userId.value, state.sheetId.value);
    recovery.value = null;
  }

  return {
    draftRestoredAt,
    draftStorageFailed,
    recovery,
    resetDrafts,
    restoreDraft,
    readRecovery,
    draftSettled,
    keepAsRecovery,
    discardDraft,
    dismissDraftNotice,
    restoreRecovery,
    discardRecovery,
  };
}

export type SheetDraftsState = ReturnType<typeof useSheetDrafts>;
