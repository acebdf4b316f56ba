/**
 * The sheet: its document schema, the checker that finds every problem cell by cell, the
 * parameter resolver, the engine plan builder and the dependencies between cells.
 */
export * from './document';
export { checkSheet } from './check';
export { SheetIssuesError, describeIssue, type SheetIssue } from './issues';
export { resolveParameters } from './resolve';
export { buildSimulationPlan, stepCount } from './plan';
export { sheetCellDependencies } from './dependencies';
export { reservedNameProblem, TIME_NAME } from './names';
export { isPositiveDefinite } from './correlation';
