import { cellDetails } from './diff-details';
import { changeText } from './diff-format';
import type { SheetDocument } from './document';

/**
 * The difference between two versions of a sheet: cells added, removed, moved and changed, and
 * inside a changed cell what changed, in words. One pure function over the documents' plain data;
 * the history page and the tests use the same code.
 */

export interface CellDiff {
  cellId: string;
  /** The cell's kind (after the change; before it, for a removed cell). */
  cellKind: string;
  change: 'added' | 'removed' | 'kept';
  /** Positions (from 0) when the cell moved relative to the cells both versions have. */
  moved: { from: number; to: number } | null;
  /** What changed inside a kept cell; empty for an added or removed one. */
  details: string[];
}

export interface SheetDiff {
  /** `title: "A" → "B"` when the title changed. */
  title: string | null;
  /** Only the cells that differ, in the order of the newer version, removed ones where they were. */
  cells: CellDiff[];
  /** True when nothing differs. */
  same: boolean;
}

type DocumentData = Pick<SheetDocument, 'title'> & { cells: readonly { id: string; kind: string }[] };

/** Longest common subsequence of two id lists: the cells that kept their relative order. */
function inOrder(before: string[], after: string[]): Set<string> {
  const lengths = Array.from({ length: before.length + 1 }, () =>
    new Array<number>(after.length + 1).fill(0),
  );
  for (let i = before.length - 1; i >= 0; i -= 1) {
    for (let j = after.length - 1; j >= 0; j -= 1) {
      lengths[i]![j] =
        before[i] === after[j]
          ? lengths[i + 1]![j + 1]! + 1
          : Math.max(lengths[i + 1]![j]!, lengths[i]![j + 1]!);
    }
  }
  const kept = new Set<string>();
  let i = 0;
  let j = 0;
  while (i < before.length && j < after.length) {
    if (before[i] === after[j]) {
      kept.add(before[i]!);
      i += 1;
      j += 1;
    } else if (lengths[i + 1]![j]! >= lengths[i]![j + 1]!) i += 1;
    else j += 1;
  }
  return kept;
}

export function diffSheets(before: DocumentData, after: DocumentData): SheetDiff {
  const beforeIds = before.cells.map((cell) => cell.id);
  const afterIds = after.cells.map((cell) => cell.id);
  const afterSet = new Set(afterIds);
  const beforeById = new Map(before.cells.map((cell, index) => [cell.id, { cell, index }]));
  const common = (ids: string[], other: Set<string>) => ids.filter((id) => other.has(id));
  const orderKept = inOrder(common(beforeIds, afterSet), common(afterIds, new Set(beforeIds)));

  const cells: CellDiff[] = [];
  after.cells.forEach((cell, index) => {
    const previous = beforeById.get(cell.id);
    if (!previous) {
      cells.push({ cellId: cell.id, cellKind: cell.kind, change: 'added', moved: null, details: [] });
      return;
    }
    const moved = orderKept.has(cell.id) ? null : { from: previous.index, to: index };
    const details = cellDetails(previous.cell as Record<string, unknown>, cell as Record<string, unknown>);
    if (moved || details.length > 0) {
      cells.push({ cellId: cell.id, cellKind: cell.kind, change: 'kept', moved, details });
    }
  });
  // A removed cell is listed after the kept cell that came before it.
  before.cells.forEach((cell, index) => {
    if (afterSet.has(cell.id)) return;
    const removed: CellDiff = {
      cellId: cell.id,
      cellKind: cell.kind,
      change: 'removed',
      moved: null,
      details: [],
    };
    const anchor = beforeIds
      .slice(0, index)
      .reverse()
      .find((id) => afterSet.has(id));
    const anchorAt = anchor ? afterIds.indexOf(anchor) : -1;
    const insertAt = cells.findIndex(
      (entry) => entry.change !== 'removed' && afterIds.indexOf(entry.cellId) > anchorAt,
    );
    cells.splice(insertAt === -1 ? cells.length : insertAt, 0, removed);
  });

  const title = before.title === after.title ? null : changeText('title', before.title, after.title);
  return { title, cells, same: title === null && cells.length === 0 };
}
