/**
 * The sheet: its document schema (cells from the kind registry in shared/cells), upgrades of old
 * documents, the checker that finds every problem cell by cell, the parameter resolver, the
 * engine plan builder, the dependencies between cells, fingerprints and cell-list operations.
 */
export * from './document';
export { upgradeDocument, parseSheetDocument, DocumentVersionError } from './upgrade';
export { checkSheet } from './check';
export { collectIssues, describeIssuePath, type CollectedIssues } from './collect-issues';
export { SheetIssuesError, describeIssue, type SheetIssue, type CellIssue } from './issues';
export { resolveParameters } from './resolve';
export { buildSimulationPlan, stepCount } from './plan';
export { sheetCellDependencies, transitiveDependencies } from './dependencies';
export { stableStringify, hashText, cellFingerprint, sheetFingerprints } from './fingerprint';
export { reservedNameProblem, TIME_NAME } from './names';
export { isPositiveDefinite } from './correlation';
