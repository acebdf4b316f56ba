import type { Cell, SheetDocument } from '@shared/sheet/document';
import type { SimulationPlan } from '@shared/engine/plan';

/**
 * The contract between the sheet page (which owns the document, runs cells and keeps outputs) and
 * the per-kind cell editors in this folder. Editors never mutate `cell`: they emit `update` with a
 * new cell object; the page stores it, keeps the draft, and marks dependants stale.
 */
export interface CellIssue {
  /** Path inside the cell, e.g. ['states', 0, 'drift']. */
  path: (string | number)[];
  message: string;
  from?: number;
  to?: number;
}

/** What a run left on a cell. Charts read the output of the simulation they name. */
export type CellOutput =
  | {
      kind: 'simulation';
      plan: SimulationPlan;
      result: import('@shared/engine').SimulationResult;
      finishedAt: Date;
      seconds: number;
    }
  | { kind: 'probe'; estimate: import('@shared/engine').ProbeEstimate; finishedAt: Date }
  | {
      kind: 'study';
      plan: SimulationPlan;
      result: import('@shared/engine').StudyResult;
      finishedAt: Date;
      seconds: number;
    }
  | { kind: 'error'; message: string; finishedAt: Date };

export interface CellEditorProps<C extends Cell = Cell> {
  cell: C;
  /** The whole sheet, for names in scope and references to other cells. */
  document: SheetDocument;
  /** Problems the sheet checker found in this cell. */
  issues: CellIssue[];
  /** Outputs of all cells by id (a chart or probe reads its simulation's). */
  outputs: Record<string, CellOutput | undefined>;
  /** The cell's inputs changed since its output was computed. */
  stale: boolean;
  readonly: boolean;
}

export type CellEditorEmits<C extends Cell = Cell> = {
  update: [cell: C];
};
