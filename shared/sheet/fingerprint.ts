import type { SheetDocument } from './document';
import { transitiveDependencies } from './dependencies';

/**
 * Fingerprints of a cell's inputs: the cell itself and every cell it reads, directly or through
 * others. An output remembers the fingerprint it was computed from; when the current one differs,
 * the output is stale.
 */

/** JSON with object keys sorted at every level, so equal values give equal text. */
export function stableStringify(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) return `[${value.map((item) => stableStringify(item ?? null)).join(',')}]`;
  const record = value as Record<string, unknown>;
  const keys = Object.keys(record)
    .filter((key) => record[key] !== undefined)
    .sort();
  return `{${keys.map((key) => `${JSON.stringify(key)}:${stableStringify(record[key])}`).join(',')}}`;
}

/**
 * Two 32-bit FNV-1a hashes with different offset bases, as 16 hex digits. Not cryptographic: it only
 * tells "same inputs" from "changed inputs" (FNV-1a: Fowler, Noll & Vo, public-domain reference).
 */
export function hashText(text: string): string {
  let a = 0x811c9dc5;
  let b = 0x01000193 ^ 0x5bd1e995;
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    a = Math.imul(a ^ code, 0x01000193);
    b = Math.imul(b ^ code, 0x01000193) ^ (b >>> 15);
  }
  return (a >>> 0).toString(16).padStart(8, '0') + (b >>> 0).toString(16).padStart(8, '0');
}

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
