import { CELL_KINDS } from '../cells/registry';
import type { Cell, CellKind, SheetDocument } from './document';

/**
 * Pure operations on the cell list: a new cell of a kind, insert, replace, move, duplicate,
 * remove. Each returns a new document; the editor keeps the result.
 */

function randomHex(): string {
  const uuid = globalThis.crypto?.randomUUID?.();
  if (uuid) return uuid.replace(/-/g, '').slice(0, 8);
  return Math.floor(Math.random() * 0xffffffff)
    .toString(16)
    .padStart(8, '0');
}

/** A fresh cell id with a kind prefix, e.g. "model-3f9a01c2", unused in the document. */
export function newCellId(kind: CellKind, doc: SheetDocument): string {
  const taken = new Set(doc.cells.map((cell) => cell.id));
  for (;;) {
    const id = `${kind}-${randomHex()}`;
    if (!taken.has(id)) return id;
  }
}

/** Every name a sheet defines: parameters, state variables, noise sources. */
export function namesInUse(doc: SheetDocument): Set<string> {
  const names = new Set<string>();
  for (const cell of doc.cells) {
    if (cell.kind === 'params') cell.params.forEach((param) => names.add(param.name));
    if (cell.kind === 'model') {
      cell.states.forEach((state) => names.add(state.name));
      cell.noises.forEach((noise) => names.add(noise.name));
    }
  }
  return names;
}

/** Why a kind cannot be added at `index` yet, or null when it can. */
export function cannotAddReason(doc: SheetDocument, kind: CellKind, index: number): string | null {
  return CELL_KINDS[kind].cannotAdd?.(doc, index) ?? null;
}

/**
 * A sensible new cell of `kind` to be inserted at `index`: names that clash with nothing, and
 * references to the nearest model or simulation above.
 */
export function defaultCell(kind: CellKind, doc: SheetDocument, index: number): Cell {
  return CELL_KINDS[kind].create({ id: newCellId(kind, doc), doc, index, taken: namesInUse(doc) });
}

export function insertCell(doc: SheetDocument, index: number, cell: Cell): SheetDocument {
  const cells = [...doc.cells];
  cells.splice(Math.max(0, Math.min(index, cells.length)), 0, cell);
  return { ...doc, cells };
}

export function replaceCell(doc: SheetDocument, cell: Cell): SheetDocument {
  return { ...doc, cells: doc.cells.map((existing) => (existing.id === cell.id ? cell : existing)) };
}

/** Moves a cell by `delta` places (−1 up, +1 down); unchanged at the ends. */
export function moveCell(doc: SheetDocument, cellId: string, delta: number): SheetDocument {
  const from = doc.cells.findIndex((cell) => cell.id === cellId);
  const to = from + delta;
  if (from < 0 || to < 0 || to >= doc.cells.length) return doc;
  const cells = [...doc.cells];
  const [moved] = cells.splice(from, 1);
  cells.splice(to, 0, moved!);
  return { ...doc, cells };
}

/** A copy with a new id, placed right below the original. */
export function duplicateCell(doc: SheetDocument, cellId: string): { doc: SheetDocument; copy: Cell | null } {
  const index = doc.cells.findIndex((cell) => cell.id === cellId);
  if (index < 0) return { doc, copy: null };
  const original = doc.cells[index]!;
  // JSON copy: the document is plain JSON, and reactive proxies cannot go through structuredClone.
  const copy = {
    ...(JSON.parse(JSON.stringify(original)) as Cell),
    id: newCellId(original.kind, doc),
  } as Cell;
  return { doc: insertCell(doc, index + 1, copy), copy };
}

export interface RemovedCell {
  cell: Cell;
  index: number;
}

export function removeCell(
  doc: SheetDocument,
  cellId: string,
): { doc: SheetDocument; removed: RemovedCell | null } {
  const index = doc.cells.findIndex((cell) => cell.id === cellId);
  if (index < 0) return { doc, removed: null };
  return {
    doc: { ...doc, cells: doc.cells.filter((cell) => cell.id !== cellId) },
    removed: { cell: doc.cells[index]!, index },
  };
}
