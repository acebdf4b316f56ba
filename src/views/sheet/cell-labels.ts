import type { Cell } from '@shared/sheet/document';
import { CELL_KIND_LABELS } from '@/stores/sheet-editor-cells';

const PROBE_WORDS: Record<string, string> = {
  mean: 'mean',
  variance: 'variance',
  quantile: 'quantile',
  exceedance: 'P(≥ level)',
  subceedance: 'P(≤ level)',
  'hit-before': 'P(reach level)',
  'first-passage': 'first-passage time',
  extinction: 'extinction probability',
};

/** A short title for the card header, read from the cell's own fields. */
export function cellTitle(cell: Cell): string {
  switch (cell.kind) {
    case 'note': {
      const firstLine = cell.text.split('\n').find((line) => line.trim() !== '') ?? '';
      const text = firstLine.replace(/^#+\s*/, '').trim();
      return text.length > 60 ? `${text.slice(0, 57)}…` : text;
    }
    case 'params':
      return cell.params.map((param) => param.name).join(', ');
    case 'model':
      return cell.name ?? cell.states.map((state) => state.name).join(', ');
    case 'simulation':
      return cell.name ?? `${cell.paths} paths, t from ${cell.t0} to ${cell.t1}`;
    case 'chart':
      return cell.title ?? `${cell.view} of ${cell.state}`;
    case 'probe':
      return `${PROBE_WORDS[cell.quantity] ?? cell.quantity} of ${cell.state}`;
    case 'study':
      return `${cell.levels} step sizes, ${cell.paths} paths`;
  }
}

export function cellKindLabel(cell: Cell): string {
  return CELL_KIND_LABELS[cell.kind];
}

/** "3.2 s", "1 min 05 s": for elapsed and remaining run time. */
export function formatDuration(ms: number): string {
  const seconds = Math.max(0, ms) / 1000;
  if (seconds < 10) return `${seconds.toFixed(1)} s`;
  if (seconds < 60) return `${Math.round(seconds)} s`;
  const minutes = Math.floor(seconds / 60);
  return `${minutes} min ${String(Math.round(seconds - minutes * 60)).padStart(2, '0')} s`;
}
