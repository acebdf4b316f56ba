import type { z } from 'zod';
import {
  cellIdSchema,
  checkSheet,
  describeIssue,
  parseSheetDocument,
  type SheetDocument,
  type SheetIssue,
} from '../../shared/sheet/index';

/**
 * Reads a sheet file's text into a checked document, or lists every problem found: first the
 * schema (zod), then the sheet checker (names, expressions, references between cells). Each
 * problem names its cell and the place inside it.
 */
export type ValidationOutcome = { ok: true; doc: SheetDocument } | { ok: false; problems: string[] };

function pathText(path: readonly PropertyKey[]): string {
  return path
    .map((part, i) => (typeof part === 'number' ? `[${part}]` : i === 0 ? String(part) : `.${String(part)}`))
    .join('');
}

/** Locates a schema issue: inside a cell (by its id when it has one) or at the document level. */
function describeSchemaIssue(issue: z.core.$ZodIssue, raw: unknown): string {
  const [first, index, ...rest] = issue.path;
  if (first === 'cells' && typeof index === 'number') {
    const cells = (raw as { cells?: unknown[] }).cells;
    const cell = Array.isArray(cells) ? cells[index] : undefined;
    const id = cellIdSchema.safeParse(
      cell && typeof cell === 'object' ? (cell as { id?: unknown }).id : undefined,
    );
    const where = id.success ? `cell ${id.data}` : `cell #${index + 1} (no valid id)`;
    const path = pathText(rest);
    return `${where}${path ? `, ${path}` : ''}: ${issue.message}`;
  }
  const path = pathText(issue.path);
  return `sheet${path ? `, ${path}` : ''}: ${issue.message}`;
}

export function validateSheetText(text: string): ValidationOutcome {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    return {
      ok: false,
      problems: [`sheet: not valid JSON (${error instanceof Error ? error.message : String(error)})`],
    };
  }
  const parsed = parseSheetDocument(raw);
  if (!parsed.success)
    return { ok: false, problems: parsed.error.issues.map((issue) => describeSchemaIssue(issue, raw)) };
  const issues: SheetIssue[] = checkSheet(parsed.data);
  if (issues.length > 0) return { ok: false, problems: issues.map(describeIssue) };
  return { ok: true, doc: parsed.data };
}
