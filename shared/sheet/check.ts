import { kindOf } from '../cells/registry';
import type { SheetDocument } from './document';
import { checkCellIds, checkNames } from './check-names';
import { checkParameterValues } from './check-params';
import type { SheetIssue } from './issues';
import { analyseParameters, evaluateParameters } from './parameters';
import { indexSheet } from './sheet-index';

/**
 * Every problem of a (schema-valid) sheet, each located in a cell: what spans cells first (cell
 * ids, names, parameter definitions and cycles), then each cell's own checks from its kind.
 */
export function checkSheet(doc: SheetDocument): SheetIssue[] {
  const index = indexSheet(doc);
  const analysis = analyseParameters(index);
  const issues: SheetIssue[] = [...checkCellIds(index), ...checkNames(index), ...analysis.issues];
  issues.push(...checkParameterValues(index, analysis));
  const parameterValues = analysis.issues.length === 0 ? evaluateParameters(index, analysis).values : null;
  for (const cell of doc.cells) {
    const check = kindOf(cell).check;
    if (check) issues.push(...check(cell, { index, parameterValues }));
  }
  return issues;
}
