import { kindOf } from '../cells/registry';
import type { SheetDocument } from './document';

/**
 * Which cells each cell reads, from each kind's `reads`, for stale marking and "run this cell
 * with what it needs". Only ids of existing cells appear, without the cell itself; every cell has
 * an entry.
 */
export function sheetCellDependencies(doc: SheetDocument): Map<string, string[]> {
  const existing = new Set(doc.cells.map((c) => c.id));
  const paramsCellIds = doc.cells.filter((c) => c.kind === 'params').map((c) => c.id);
  const definedIn = new Map<string, string>();
  for (const cell of doc.cells) {
    if (cell.kind !== 'params') continue;
    for (const p of cell.params) if (!definedIn.has(p.name)) definedIn.set(p.name, cell.id);
  }

  const dependencies = new Map<string, string[]>();
  for (const cell of doc.cells) {
    const list = dependencies.get(cell.id) ?? [];
    for (const read of kindOf(cell).reads(cell, { paramsCellIds, definedIn })) {
      if (read !== cell.id && existing.has(read) && !list.includes(read)) list.push(read);
    }
    dependencies.set(cell.id, list);
  }
  return dependencies;
}

/** Every cell id `cellId` reads, directly or indirectly, without itself, sorted. */
export function transitiveDependencies(
  cellId: string,
  dependencies: ReadonlyMap<string, readonly string[]>,
): string[] {
  const seen = new Set<string>();
  const pending = [...(dependencies.get(cellId) ?? [])];
  while (pending.length > 0) {
    const next = pending.pop()!;
    if (next === cellId || seen.has(next)) continue;
    seen.add(next);
    pending.push(...(dependencies.get(next) ?? []));
  }
  return [...seen].sort();
}
