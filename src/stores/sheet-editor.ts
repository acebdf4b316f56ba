import { defineStore } from 'pinia';
import { useSheetDocument } from './sheet/document';
import { useSheetDrafts } from './sheet/drafts';
import { useSheetRuns } from './sheet/runs';
import { useSavedResults } from './sheet/saved-results';
import { useRunGuard } from './sheet/run-guard';
import { useSheetVersions } from './sheet/versions';
import { useSheetSharing } from './sheet/sharing';
import { useSheetComments } from './sheet/comments';
import { useSheetHistory } from './sheet/history';
import { useSheetHead } from './sheet/head';
import { useFitValues } from './sheet/fit-values';

/**
 * The sheet being edited, as one store for the sheet page, made of pieces by job (in ./sheet/):
 * the document and its edits, the local drafts, runs and their outputs, the guard in front of
 * every run, loading, versions and saving, sharing, comments, history (diffs, restore, forks,
 * rerun and compare) and the watch for newer versions. The pure work (cell operations, checks,
 * fingerprints, the run orchestrator, diffs, the rerun comparison) lives in shared/. Components
 * read it with storeToRefs and call its actions.
 */
export const useSheetEditorStore = defineStore('sheet-editor', () => {
  const document = useSheetDocument();
  const drafts = useSheetDrafts(document);
  const runs = useSheetRuns(document);
  const savedResults = useSavedResults(document, runs);
  const versions = useSheetVersions(document, drafts, runs, savedResults);
  // The guard's `run` replaces the runs piece's: every run goes through its checks.
  const guard = useRunGuard(document, runs);
  const reload = () => versions.load(document.sheetId.value!, { userId: document.userId.value });
  const sharing = useSheetSharing(document, reload);
  const comments = useSheetComments(document);
  const history = useSheetHistory(document, runs, versions.lineage, reload);
  const head = useSheetHead(document);
  const fitValues = useFitValues(document, runs);
  return {
    ...document,
    ...drafts,
    ...runs,
    ...versions,
    ...guard,
    ...sharing,
    ...comments,
    ...history,
    ...head,
    ...fitValues,
  };
});
