import type { z } from 'zod';
import type { DatasetProvider } from '../../shared/data/provider';
import { parseSheetFile, SHEET_FILE_FORMAT, sheetFileDatasets } from '../../shared/sheet-file/sheet-file';
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

/** A checked document and, for a sheet file, its embedded datasets. */
export type LoadedSheet =
  { ok: true; doc: SheetDocument; datasets?: DatasetProvider } | { ok: false; problems: string[] };

/**
 * Reads either a bare sheet document or a Meander sheet file (a document with its datasets,
 * digests and engine version, as the sheet page exports it).
 */
export async function loadSheetText(text: string): Promise<LoadedSheet> {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    return validateSheetText(text);
  }
  const isSheetFile =
    raw !== null && typeof raw === 'object' && (raw as { format?: unknown }).format === SHEET_FILE_FORMAT;
  if (!isSheetFile) return validateSheetText(text);
  const parsed = await parseSheetFile(raw);
  if (!parsed.ok)
    return { ok: false, problems: [`${pathText(parsed.fault.path) || 'file'}: ${parsed.fault.message}`] };
  const issues: SheetIssue[] = checkSheet(parsed.file.document);
  if (issues.length > 0) return { ok: false, problems: issues.map(describeIssue) };
  try {
    return { ok: true, doc: parsed.file.document, datasets: sheetFileDatasets(parsed.file) };
  } catch (error) {
    return { ok: false, problems: [error instanceof Error ? error.message : String(error)] };
  }
}
