import { checkExpression, type CheckedExpr } from '../expr';
import type { SheetIssue } from './issues';

/** Checks one expression field of a cell; pushes its errors as issues and returns the tree when valid. */
export function checkField(
  issues: SheetIssue[],
  cellId: string,
  path: (string | number)[],
  text: string,
  scope: readonly string[],
): CheckedExpr | null {
  const result = checkExpression(text, scope);
  if (result.ok) return result.tree;
  for (const error of result.errors)
    issues.push({ cellId, path, message: error.message, from: error.from, to: error.to });
  return null;
}
