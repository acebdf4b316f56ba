import type { Cell, CellKind, ModelCell, SheetDocument, SimulationCell } from '../sheet/document';

/** Small look-ups the kinds share when they make a new cell. */

/** `base`, or `base2`, `base3` … whichever is not taken yet. */
export function freshName(base: string, taken: ReadonlySet<string>): string {
  if (!taken.has(base)) return base;
  for (let n = 2; ; n++) if (!taken.has(`${base}${n}`)) return `${base}${n}`;
}

/** The nearest cell of a kind above `index`, else the first one below it. */
export function nearestCell<K extends CellKind>(
  doc: SheetDocument,
  kind: K,
  index: number,
): Extract<Cell, { kind: K }> | undefined {
  const isKind = (cell: Cell): cell is Extract<Cell, { kind: K }> => cell.kind === kind;
  for (let i = Math.min(index, doc.cells.length) - 1; i >= 0; i--) {
    const cell = doc.cells[i]!;
    if (isKind(cell)) return cell;
  }
  return doc.cells.slice(index).find(isKind);
}

/** The first state variable of the model a simulation runs ("x" when there is none yet). */
export function firstStateOf(doc: SheetDocument, simulation: SimulationCell | undefined): string {
  const model = doc.cells.find(
    (cell): cell is ModelCell => cell.kind === 'model' && cell.id === simulation?.model,
  );
  return model?.states[0]?.name ?? 'x';
}

/** For kinds that read a simulation: "add a simulation first" until there is one. */
export function needsSimulation(doc: SheetDocument, index: number): string | null {
  return nearestCell(doc, 'simulation', index) ? null : 'add a simulation first';
}

/** Wall-clock seconds since `started` (a performance.now() reading). */
export function secondsSince(started: number): number {
  return (performance.now() - started) / 1000;
}
