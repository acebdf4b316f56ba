import { checkSheet } from './check';
import { sheetDocumentSchema, type SheetDocument } from './document';
import type { CellIssue } from './issues';

/**
 * Gathers what is wrong with a document, per cell: first the shape (the zod schema: a number out
 * of range, a missing field), then the sheet checker's findings (names, expressions, references).
 * Problems outside any cell (the title) are listed for the sheet as a whole.
 */

export interface CollectedIssues {
  byCell: Record<string, CellIssue[]>;
  sheet: string[];
}

function push(target: Record<string, CellIssue[]>, cellId: string, issue: CellIssue): void {
  (target[cellId] ??= []).push(issue);
}

export function collectIssues(doc: SheetDocument): CollectedIssues {
  const byCell: Record<string, CellIssue[]> = {};
  const sheet: string[] = [];
  const shape = sheetDocumentSchema.safeParse(doc);
  if (!shape.success) {
    for (const issue of shape.error.issues) {
      const [head, index, ...rest] = issue.path;
      const cell = head === 'cells' && typeof index === 'number' ? doc.cells[index] : undefined;
      if (cell)
        push(byCell, cell.id, {
          path: rest.map((part) => (typeof part === 'symbol' ? String(part) : part)),
          message: issue.message,
        });
      else sheet.push(issue.path.length > 0 ? `${issue.path.join('.')}: ${issue.message}` : issue.message);
    }
    // The checker expects a well-formed document; the shape problems come first anyway.
    return { byCell, sheet };
  }
  try {
    for (const issue of checkSheet(shape.data)) {
      const found: CellIssue = { path: issue.path, message: issue.message };
      if (issue.from !== undefined) found.from = issue.from;
      if (issue.to !== undefined) found.to = issue.to;
      push(byCell, issue.cellId, found);
    }
  } catch (error) {
    sheet.push(`The sheet could not be checked: ${error instanceof Error ? error.message : String(error)}`);
  }
  return { byCell, sheet };
}

/** "states.0.drift" → "state 1, drift": a path a person can follow. */
export function describeIssuePath(path: readonly (string | number)[]): string {
  const words: string[] = [];
  for (let i = 0; i < path.length; i++) {
    const part = path[i]!;
    const next = path[i + 1];
    if (typeof part === 'string' && typeof next === 'number') {
      words.push(`${part.replace(/s$/, '')} ${next + 1}`);
      i++;
    } else {
      words.push(String(part));
    }
  }
  return words.join(', ');
}
