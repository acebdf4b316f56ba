import { checkExpression } from '../expr';
import type { SheetDocument } from './document';

/**
 * Which cells each cell reads, for stale marking and "run this cell with what it needs": a
 * simulation reads its model and every params cell; a model reads the params cells; a params
 * cell reads the params cells whose parameters its expressions use; charts, probes and studies
 * read their simulation. Only ids of existing cells appear; every cell has an entry.
 */
export function sheetCellDependencies(doc: SheetDocument): Map<string, string[]> {
  const existing = new Set(doc.cells.map((c) => c.id));
  const paramsCellIds = doc.cells.filter((c) => c.kind === 'params').map((c) => c.id);
  const definedIn = new Map<string, string>();
  for (const cell of doc.cells) {
    if (cell.kind !== 'params') continue;
    for (const p of cell.params) if (!definedIn.has(p.name)) definedIn.set(p.name, cell.id);
  }
  const scope = [...definedIn.keys()];

  const dependencies = new Map<string, string[]>();
  const add = (id: string, reads: readonly string[]) => {
    const list = dependencies.get(id) ?? [];
    for (const read of reads) if (read !== id && existing.has(read) && !list.includes(read)) list.push(read);
    dependencies.set(id, list);
  };
  for (const cell of doc.cells) {
    switch (cell.kind) {
      case 'note':
        add(cell.id, []);
        break;
      case 'params': {
        const reads: string[] = [];
        for (const p of cell.params) {
          if (typeof p.value !== 'string') continue;
          const checked = checkExpression(p.value, scope);
          if (!checked.ok) continue;
          for (const name of checked.tree.names) reads.push(definedIn.get(name) ?? '');
        }
        add(cell.id, reads);
        break;
      }
      case 'model':
        add(cell.id, paramsCellIds);
        break;
      case 'simulation':
        add(cell.id, [cell.model, ...paramsCellIds]);
        break;
      case 'chart':
      case 'probe':
      case 'study':
        add(cell.id, [cell.simulation]);
        break;
    }
  }
  return dependencies;
}
