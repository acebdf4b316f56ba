import type { SheetDocument } from './document';
import { transitiveDependencies } from './dependencies';
import { hashText, stableStringify } from './stable-json';

export { hashText, stableStringify };

/**
 * Fingerprints of a cell's inputs: the cell itself and every cell it reads, directly or through
 * others. An output remembers the fingerprint it was computed from; when the current one differs,
 * the output is stale.
 */

/** Each cell's stable text, computed once per document. */
function cellTexts(doc: SheetDocument): Map<string, string> {
  return new Map(doc.cells.map((cell) => [cell.id, stableStringify(cell)]));
}

/** The hash of the stable text of [cell, ...its inputs in id order] (a missing input as { missing }). */
function fingerprintFrom(
  cellId: string,
  dependencies: ReadonlyMap<string, readonly string[]>,
  texts: ReadonlyMap<string, string>,
): string {
  const inputs = [cellId, ...transitiveDependencies(cellId, dependencies)].map(
    (id) => texts.get(id) ?? stableStringify({ missing: id }),
  );
  return hashText(`[${inputs.join(',')}]`);
}

export function cellFingerprint(
  doc: SheetDocument,
  cellId: string,
  dependencies: ReadonlyMap<string, readonly string[]>,
): string {
  return fingerprintFrom(cellId, dependencies, cellTexts(doc));
}

/** Fingerprints of every cell of the document, keyed by id (each cell stringified once). */
export function sheetFingerprints(
  doc: SheetDocument,
  dependencies: ReadonlyMap<string, readonly string[]>,
): Record<string, string> {
  const texts = cellTexts(doc);
  const result: Record<string, string> = {};
  for (const cell of doc.cells) result[cell.id] = fingerprintFrom(cell.id, dependencies, texts);
  return result;
}
