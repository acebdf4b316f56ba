import type { SheetIssue } from './issues';
import { evaluateParameters, type ParameterAnalysis } from './parameters';
import type { SheetIndex } from './sheet-index';

/** Ranges (min ≤ value ≤ max for numbers, min ≤ max) and values that come out non-finite. */
export function checkParameterValues(index: SheetIndex, analysis: ParameterAnalysis): SheetIssue[] {
  const issues: SheetIssue[] = [];
  for (const cell of index.paramsCells) {
    cell.params.forEach((parameter, i) => {
      const { name, value, min, max } = parameter;
      if (min !== undefined && max !== undefined && min > max) {
        issues.push({
          cellId: cell.id,
          path: ['params', i, 'max'],
          message: `the maximum of '${name}' (${max}) is below its minimum (${min})`,
        });
        return;
      }
      if (typeof value !== 'number') return;
      if (min !== undefined && value < min) {
        issues.push({
          cellId: cell.id,
          path: ['params', i, 'value'],
          message: `'${name}' is ${value}, below its minimum ${min}`,
        });
      }
      if (max !== undefined && value > max) {
        issues.push({
          cellId: cell.id,
          path: ['params', i, 'value'],
          message: `'${name}' is ${value}, above its maximum ${max}`,
        });
      }
    });
  }
  if (analysis.issues.length === 0) {
    for (const failure of evaluateParameters(index, analysis).failures) {
      const entry = index.parameters.get(failure.name);
      if (entry)
        issues.push({
          cellId: entry.cellId,
          path: ['params', entry.index, 'value'],
          message: failure.message,
        });
    }
  }
  return issues;
}
