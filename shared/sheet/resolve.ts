import { checkSheet } from './check';
import type { SheetDocument } from './document';
import { SheetIssuesError, type SheetIssue } from './issues';
import { analyseParameters, evaluateParameters } from './parameters';
import { indexSheet, type SheetIndex } from './sheet-index';

/**
 * Values of all parameters, in dependency order, with `overrides` replacing the sheet's own
 * values. Throws a SheetIssuesError when the parameters have problems (names, expressions,
 * cycles, ranges), an override names no parameter, or a value comes out non-finite.
 */
export function resolveParameters(
  doc: SheetDocument,
  overrides: Readonly<Record<string, number>> = {},
): Record<string, number> {
  const index = indexSheet(doc);
  const paramsCellIds = new Set(index.paramsCells.map((c) => c.id));
  const issues = checkSheet(doc).filter((issue) => paramsCellIds.has(issue.cellId));
  if (issues.length > 0) throw new SheetIssuesError(issues, 'the parameters');
  return resolveCheckedParameters(index, overrides, '');
}

/** Resolution once the sheet's parameters are known to be sound; `cellId` locates override problems. */
export function resolveCheckedParameters(
  index: SheetIndex,
  overrides: Readonly<Record<string, number>>,
  cellId: string,
): Record<string, number> {
  const issues: SheetIssue[] = [];
  for (const [name, value] of Object.entries(overrides)) {
    if (!index.parameters.has(name))
      issues.push({
        cellId,
        path: ['overrides', name],
        message: `there is no parameter '${name}' to override`,
      });
    else if (!Number.isFinite(value))
      issues.push({
        cellId,
        path: ['overrides', name],
        message: `the override of '${name}' is not a finite number`,
      });
  }
  if (issues.length > 0) throw new SheetIssuesError(issues, 'the overrides');
  const { values, failures } = evaluateParameters(index, analyseParameters(index), overrides);
  if (failures.length > 0) {
    throw new SheetIssuesError(
      failures.map((failure) => {
        const entry = index.parameters.get(failure.name);
        return {
          cellId: entry?.cellId ?? cellId,
          path: ['params', entry?.index ?? 0, 'value'],
          message: failure.message,
        };
      }),
      'the parameters',
    );
  }
  return values;
}
