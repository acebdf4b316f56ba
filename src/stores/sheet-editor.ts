import { defineStore } from 'pinia';
import { useSheetDocument } from './sheet/document';
import { useSheetDrafts } from './sheet/drafts';
import { useSheetRuns } from './sheet/runs';
import { useRunGuard } from './sheet/run-guard';
import { useSheetVersions } from './sheet/versions';

/**
 * The sheet being edited, as one store for the sheet page, made of pieces by job (in
 * ./sheet/): the document and its edits, the local drafts, runs and their outputs, and loading,
 * versions and saving, and the guard in front of every run. The pure work (cell operations, checks, fingerprints, the run
 * orchestrator) lives in shared/. Components read it with storeToRefs and call its actions.
 */
export const useSheetEditorStore = defineStore('sheet-editor', () => {
  const document = useSheetDocument();
  const drafts = useSheetDrafts(document);
  const runs = useSheetRuns(document);
  const versions = useSheetVersions(document, drafts, runs);
  // The guard's `run` replaces the runs piece's: every run goes through its checks.
  const guard = useRunGuard(document, runs);
  return { ...document, ...drafts, ...runs, ...versions, ...guard };
});
