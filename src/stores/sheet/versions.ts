import { ref } from 'vue';
import {
  createSheet,
  getSheet,
  getVersion,
  listVersions,
  saveVersion,
  versionConflict,
  type SheetDetail,
  type VersionSummary,
} from '@/api/sheets';
import { ENGINE_VERSION } from '@shared/engine/version';
import { errorMessage } from '@/api/http';
import type { SheetDocumentState } from './document';
import type { SheetDraftsState } from './drafts';
import type { SheetRunsState } from './runs';
import type { SavedResultsState } from './saved-results';

/**
 * Loading a sheet or one of its versions, the list of versions, saving a version against the
 * base the edits started from, and the choices after a conflict (409): load theirs and keep mine
 * as a recovery copy, or put mine in a new sheet.
 */
export function useSheetVersions(
  state: SheetDocumentState,
  drafts: SheetDraftsState,
  runs: SheetRunsState,
  savedResults: SavedResultsState,
) {
  const serverTitle = ref('');
  const serverUpdatedAt = ref<Date | null>(null);
  const owner = ref<{ id: string; name: string } | null>(null);
  /** Where this sheet was forked from, and how many forks of it the caller can read. */
  const lineage = ref<Pick<SheetDetail, 'forkSource' | 'forkCount' | 'forkedFromVersion'> | null>(null);
  const loading = ref(false);
  const loadError = ref<string | null>(null);
  const conflict = ref<{ currentVersion: number } | null>(null);
  const saving = ref(false);
  const saveError = ref<string | null>(null);
  const versions = ref<VersionSummary[]>([]);
  const versionsLoading = ref(false);
  const versionsError = ref<string | null>(null);

  /** Loads a sheet, or one of its older versions read-only; a local draft is restored or kept aside. */
  async function load(id: string, options: { userId: string; version?: number | null }): Promise<void> {
    if (runs.running.value) runs.cancelRun();
    state.resetDocument();
    drafts.resetDrafts();
    runs.resetOutputs();
    conflict.value = null;
    saveError.value = null;
    loadError.value = null;
    state.sheetId.value = id;
    state.userId.value = options.userId;
    loading.value = true;
    try {
      const sheet = await getSheet(id);
      if (state.sheetId.value !== id) return;
      serverTitle.value = sheet.title;
      serverUpdatedAt.value = sheet.updatedAt;
      owner.value = sheet.owner;
      state.role.value = sheet.role;
      lineage.value = {
        forkSource: sheet.forkSource,
        forkCount: sheet.forkCount,
        forkedFromVersion: sheet.forkedFromVersion,
      };
      state.latestVersion.value = sheet.version;
      state.baseVersion.value = sheet.version;
      if (options.version != null && options.version !== sheet.version) {
        const old = await getVersion(id, options.version);
        state.viewingVersion.value = old.number;
        state.serverDocument.value = old.document;
        state.document.value = old.document;
        savedResults.showSaved(old.document, old.results, old.number, old.createdAt);
      } else {
        state.serverDocument.value = sheet.document;
        state.document.value = sheet.document;
        drafts.restoreDraft(sheet.version);
      }
      drafts.readRecovery();
      state.checkNow();
      if (state.viewingVersion.value === null) {
        // The browser's cache first (current results), then the summary saved with the version.
        await savedResults.restoreCached(id);
        if (state.sheetId.value !== id) return;
        savedResults.showSaved(sheet.document, sheet.results, sheet.version, sheet.updatedAt);
      }
    } catch (error) {
      loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  /** The saved versions, newest first. */
  async function loadVersions(): Promise<void> {
    const id = state.sheetId.value;
    if (!id) return;
    versionsLoading.value = true;
    versionsError.value = null;
    try {
      versions.value = (await listVersions(id)).sort((a, b) => b.number - a.number);
    } catch (error) {
      versionsError.value = errorMessage(error);
    } finally {
      versionsLoading.value = false;
    }
  }

  /** Saves a version against the draft's base (the save also sets the sheet's title); a 409 opens the conflict choice. */
  async function save(message: string): Promise<boolean> {
    const doc = state.document.value;
    const id = state.sheetId.value;
    if (!doc || !id || state.readonly.value || saving.value) return false;
    saving.value = true;
    saveError.value = null;
    try {
      const { digests, moments, results } = runs.runRecordsNow(doc);
      const saved = await saveVersion(id, {
        baseVersion: state.baseVersion.value,
        message,
        document: doc,
        digests,
        ...(Object.keys(digests).length > 0 ? { moments, engineVersion: ENGINE_VERSION } : {}),
        ...(Object.keys(results).length > 0 ? { results } : {}),
      });
      state.baseVersion.value = saved.number;
      state.latestVersion.value = Math.max(state.latestVersion.value, saved.number);
      state.serverDocument.value = doc;
      serverUpdatedAt.value = new Date();
      serverTitle.value = doc.title.trim();
      drafts.draftSettled();
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

  /** After a conflict: keep mine as a recovery copy, then load the version that won. */
  async function loadTheirVersion(): Promise<void> {
    const id = state.sheetId.value;
    const doc = state.document.value;
    if (!id || !doc) return;
    const mine = { document: doc, baseVersion: state.baseVersion.value, savedAt: new Date() };
    const kept = drafts.keepAsRecovery(doc);
    await load(id, { userId: state.userId.value });
    if (!kept || !drafts.recovery.value) drafts.recovery.value = mine;
  }

  /** After a conflict: put my document in a new sheet; returns its id (the page navigates). */
  async function saveMineAsNewSheet(): Promise<string | null> {
    const id = state.sheetId.value;
    const doc = state.document.value;
    if (!id || !doc) return null;
    saveError.value = null;
    try {
      const title = `${doc.title.trim()} (my copy)`.slice(0, 200);
      const created = await createSheet({
        title,
        document: { ...doc, title },
        forkedFrom: { sheetId: id, version: state.baseVersion.value },
      });
      drafts.draftSettled();
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

  return {
    serverTitle,
    serverUpdatedAt,
    owner,
    lineage,
    loading,
    loadError,
    conflict,
    saving,
    saveError,
    versions,
    versionsLoading,
    versionsError,
    load,
    loadVersions,
    save,
    loadTheirVersion,
    saveMineAsNewSheet,
    dismissConflict,
  };
}
