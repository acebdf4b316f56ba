/**
 * The sheet: its document schema (cells from the kind registry in shared/cells), upgrades of old
 * documents, the checker that finds every problem cell by cell, the parameter resolver, the
 * engine plan builder, the dependencies between cells, fingerprints and cell-list operations.
 */
export * from './document';
export { parseSheetDocument } from './upgrade';
export { checkSheet } from './check';
export { collectIssues } from './collect-issues';
export { SheetIssuesError, describeIssue, type SheetIssue } from './issues';
export { resolveParameters } from './resolve';
export { buildSimulationPlan } from './plan';
export { sheetCellDependencies } from './dependencies';
export { stableStringify, cellFingerprint, sheetFingerprints } from './fingerprint';
