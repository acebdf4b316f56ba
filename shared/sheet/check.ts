import type { SheetDocument } from './document';
import { checkModel } from './check-model';
import { checkCellIds, checkNames } from './check-names';
import { checkParameterValues } from './check-params';
import { checkReader } from './check-readers';
import { checkSimulation } from './check-simulation';
import type { SheetIssue } from './issues';
import { analyseParameters, evaluateParameters } from './parameters';
import { indexSheet } from './sheet-index';

/**
 * Every problem of a (schema-valid) sheet, each located in a cell: names, expressions and their
 * scopes, parameter cycles, the model's noise, and the references between cells.
 */
export function checkSheet(doc: SheetDocument): SheetIssue[] {
  const index = indexSheet(doc);
  const analysis = analyseParameters(index);
  const issues: SheetIssue[] = [...checkCellIds(index), ...checkNames(index), ...analysis.issues];
  issues.push(...checkParameterValues(index, analysis));
  const values = analysis.issues.length === 0 ? evaluateParameters(index, analysis).values : null;
  for (const cell of doc.cells) {
    switch (cell.kind) {
      case 'model':
        issues.push(...checkModel(index, cell, values));
        break;
      case 'simulation':
        issues.push(...checkSimulation(index, cell));
        break;
      case 'chart':
      case 'probe':
      case 'study':
        issues.push(...checkReader(index, cell));
        break;
      case 'note':
      case 'params':
        break;
    }
  }
  return issues;
}
