import type { Cell } from '@shared/sheet/document';
import { kindOf } from '@shared/cells/registry';

/** A short title for the card header, read from the cell's own fields by its kind. */
export function cellTitle(cell: Cell): string {
  return kindOf(cell).title(cell);
}

/** "3.2 s", "1 min 05 s": for elapsed and remaining run time. */
export function formatDuration(ms: number): string {
  const seconds = Math.max(0, ms) / 1000;
  if (seconds < 10) return `${seconds.toFixed(1)} s`;
  if (seconds < 60) return `${Math.round(seconds)} s`;
  const minutes = Math.floor(seconds / 60);
  return `${minutes} min ${String(Math.round(seconds - minutes * 60)).padStart(2, '0')} s`;
}
