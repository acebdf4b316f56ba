import type { InjectionKey } from 'vue';
import type { Cell, SheetDocument } from '@shared/sheet/document';
import type { CellIssue } from '@shared/sheet/issues';
import type { CellOutput } from '@shared/run/outputs';

export type { CellIssue, CellOutput };

/**
 * The contract between the sheet page (which owns the document, runs cells and keeps outputs) and
 * the per-kind cell editors in this folder. Editors never mutate `cell`: they emit `update` with a
 * new cell object; the page stores it, keeps the draft, and marks dependants stale.
 */
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

/**
 * The reading view of a cell kind: the cell as a modeller reads it (equations, a table, a summary
 * line, the results), with no inputs. The card shows it until the person opens the editor.
 */
export type CellReadingProps<C extends Cell = Cell> = Omit<CellEditorProps<C>, 'readonly'>;

/**
 * Edits a cell makes beyond its own fields, provided by the sheet page: a fit writes its estimates
 * into the params cells ("Use these values", one undoable edit). Absent where nothing may be
 * edited (tests that do not provide it, old versions).
 */
export interface SheetEdits {
  /** Whether the person may edit the sheet as shown (not a viewer, not an old version). */
  mayEdit(): boolean;
  /** Returns how many parameters changed. */
  useFitEstimates(fitCellId: string): number;
}
export const sheetEditsKey: InjectionKey<SheetEdits> = Symbol('sheet edits');
