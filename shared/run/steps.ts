import { kindOf } from '../cells/registry';
import { transitiveDependencies } from '../sheet/dependencies';
import type { Cell, CellKind, SheetDocument } from '../sheet/document';

export interface RunStep {
  cellId: string;
  kind: CellKind;
  /** Run even when an up-to-date output exists (the cells the person asked for). */
  force: boolean;
}

const computes = (cell: Cell): boolean => kindOf(cell).run !== undefined;

/**
 * The steps of a run in dependency order: by each kind's rank (simulations before what reads
 * them), then in sheet order. `targetId` null means every cell that computes; otherwise the
 * target, or the cell whose output it shows (a chart's simulation), or, for a cell that computes
 * nothing itself (parameters, a model), every computing cell that reads it. What a step needs
 * (a probe's simulation) is added unforced: it runs only when its output is not current.
 */
export function planRunSteps(
  doc: SheetDocument,
  targetId: string | null,
  dependencies: ReadonlyMap<string, readonly string[]>,
): RunStep[] {
  const byId = new Map(doc.cells.map((cell) => [cell.id, cell]));
  const wanted = new Map<string, boolean>();
  const want = (id: string, force: boolean): void => {
    const cell = byId.get(id);
    if (!cell || !computes(cell)) return;
    const before = wanted.get(id);
    wanted.set(id, force || (before ?? false));
    if (before !== undefined) return;
    for (const need of kindOf(cell).run?.needs?.(cell) ?? []) want(need, false);
  };

  if (targetId === null) {
    for (const cell of doc.cells) want(cell.id, true);
  } else {
    const target = byId.get(targetId);
    const kind = target ? kindOf(target) : undefined;
    if (!target || !kind) return [];
    if (kind.run) want(target.id, true);
    else if (kind.showsOutputOf) want(kind.showsOutputOf(target), true);
    else {
      for (const cell of doc.cells) {
        if (transitiveDependencies(cell.id, dependencies).includes(targetId)) want(cell.id, true);
      }
    }
  }
  const rank = (cell: Cell): number => kindOf(cell).run?.rank ?? 0;
  return doc.cells
    .filter((cell) => wanted.has(cell.id))
    .sort((a, b) => rank(a) - rank(b))
    .map((cell) => ({ cellId: cell.id, kind: cell.kind, force: wanted.get(cell.id) ?? false }));
}
