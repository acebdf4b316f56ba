import type { Cell, SheetDocument } from '../sheet/document';
import type { FitEstimate } from './problem';

/**
 * "Use these values": a fit's estimates written into the params cells that define them, as one
 * ordinary edit of the document (so it marks the cells that read them stale and is saved with the
 * next version), and the changes it made, so that the page can undo exactly that edit. Estimates
 * are written to six significant digits, far finer than any standard error a fit reports.
 */
export interface ValueChange {
  cellId: string;
  name: string;
  from: number | string;
  to: number;
}

const SIGNIFICANT = 6;

export function applyEstimates(
  doc: SheetDocument,
  estimates: readonly Pick<FitEstimate, 'name' | 'estimate'>[],
): { doc: SheetDocument; changes: ValueChange[] } {
  const wanted = new Map(
    estimates.filter((e) => Number.isFinite(e.estimate)).map((e) => [e.name, e.estimate] as const),
  );
  const changes: ValueChange[] = [];
  const done = new Set<string>();
  const cells = doc.cells.map((cell): Cell => {
    if (cell.kind !== 'params') return cell;
    let changed = false;
    const params = cell.params.map((parameter) => {
      const estimate = wanted.get(parameter.name);
      if (estimate === undefined || done.has(parameter.name)) return parameter;
      done.add(parameter.name);
      const rounded = Number(estimate.toPrecision(SIGNIFICANT));
      const inside =
        (parameter.min === undefined || rounded > parameter.min) &&
        (parameter.max === undefined || rounded < parameter.max);
      const to = inside ? rounded : estimate;
      if (to === parameter.value) return parameter;
      changes.push({ cellId: cell.id, name: parameter.name, from: parameter.value, to });
      changed = true;
      return { ...parameter, value: to };
    });
    return changed ? { ...cell, params } : cell;
  });
  return { doc: changes.length > 0 ? { ...doc, cells } : doc, changes };
}

/** The document with `changes` taken back (parameters since renamed or removed are left alone). */
export function revertEstimates(doc: SheetDocument, changes: readonly ValueChange[]): SheetDocument {
  const cells = doc.cells.map((cell): Cell => {
    if (cell.kind !== 'params') return cell;
    const mine = changes.filter((c) => c.cellId === cell.id);
    if (mine.length === 0) return cell;
    return {
      ...cell,
      params: cell.params.map((parameter) => {
        const change = mine.find((c) => c.name === parameter.name);
        return change ? { ...parameter, value: change.from } : parameter;
      }),
    };
  });
  return { ...doc, cells };
}
