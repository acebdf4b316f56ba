import { defineStore } from 'pinia';
import { useSheetDocument } from './sheet/document';
import { useSheetDrafts } from './sheet/drafts';
import { useSheetRuns } from './sheet/runs';
import { useSheetVersions } from './sheet/versions';

/**
 * The sheet being edited, as one store for the sheet page, made of four pieces by job (in
 * ./sheet/): the document and its edits, the local drafts, runs and their outputs, and loading,
 * versions and saving. The pure work (cell operations, checks, fingerprints, the run
 * orchestrator) lives in shared/. Components read it with storeToRefs and call its actions.
 */
export const useSheetEditorStore = defineStore('sheet-editor', () => {
  const document = useSheetDocument();
  const drafts = useSheetDrafts(document);
  const runs = useSheetRuns(document);
  const versions = useSheetVersions(document, drafts, runs);
  return { ...document, ...drafts, ...runs, ...versions };
});
