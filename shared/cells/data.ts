import { z } from 'zod';
import { checksumSchema, datasetIdSchema } from '../api/datasets';
import { observedFromTable } from '../data/observe';
import type { DataCell } from '../sheet/document';
import type { SheetIssue } from '../sheet/issues';
import { findModel, wrongReference } from '../sheet/sheet-index';
import type { CellKindDefinition, CheckContext } from './kind';
import { cellIdSchema, symbolNameSchema } from './fields';
import { nearestCell } from './helpers';

const columnNameSchema = z.string().trim().min(1, 'name a column of the file').max(200);

/**
 * An observed series: a stored dataset (by id and checksum, so a version points at exactly the
 * data it was made with) and how its columns map onto a model's states.
 */
export const dataCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('data'),
  /** The uploaded dataset; null until a file is uploaded. */
  dataset: z
    .object({
      id: datasetIdSchema,
      checksum: checksumSchema,
      name: z.string().max(120, 'a dataset name is at most 120 characters'),
    })
    .nullable(),
  /** The model whose states the value columns observe. */
  model: cellIdSchema,
  timeColumn: columnNameSchema,
  columns: z
    .array(
      z.object({
        column: columnNameSchema,
        state: symbolNameSchema,
        unit: z.string().max(40, 'a unit is at most 40 characters'),
      }),
    )
    .max(50, 'a data cell maps at most 50 columns'),
  /** A column naming independent series (sites, replicates); absent for one series. */
  groupColumn: columnNameSchema.optional(),
});

function checkData(cell: DataCell, { index }: CheckContext): SheetIssue[] {
  const issues: SheetIssue[] = [];
  const issue = (path: (string | number)[], message: string) =>
    issues.push({ cellId: cell.id, path, message });
  // A new cell has no file and no mapping yet: that is a step to take, not a fault (the run says so).
  const model = findModel(index, cell.model);
  if (!model) {
    issue(['model'], wrongReference(index, cell.model, 'model'));
    return issues;
  }
  const states = model.states.map((state) => state.name);
  const seen = new Set<string>();
  cell.columns.forEach((column, i) => {
    if (!states.includes(column.state))
      issue(
        ['columns', i, 'state'],
        `'${column.state}' is not a state variable of model '${model.id}'; its states are: ${states.join(', ')}`,
      );
    if (seen.has(column.state))
      issue(['columns', i, 'state'], `two columns observe '${column.state}'; map each state once`);
    seen.add(column.state);
    if (column.column === cell.timeColumn)
      issue(['columns', i, 'column'], `'${column.column}' is the time column; pick a column of values`);
  });
  if (cell.groupColumn !== undefined && cell.groupColumn === cell.timeColumn)
    issue(['groupColumn'], 'the group column cannot also be the time column');
  return issues;
}

export const dataKind: CellKindDefinition<'data'> = {
  kind: 'data',
  label: 'Data',
  word: 'data',
  colour: 'rust',
  cannotAdd: (doc, index) => (nearestCell(doc, 'model', index) ? null : 'add a model first'),
  create({ id, doc, index }) {
    const model = nearestCell(doc, 'model', index);
    return {
      id,
      kind: 'data',
      dataset: null,
      model: model?.id ?? 'model',
      timeColumn: 'time',
      columns: [],
    };
  },
  title: (cell) => (cell.dataset ? `observed: ${cell.dataset.name}` : 'observed data (no file yet)'),
  reads: (cell) => [cell.model],
  check: checkData,
  run: {
    rank: 0,
    async execute(cell, context) {
      if (cell.dataset === null) throw new Error('no file yet: upload a CSV or TSV file of observations');
      if (cell.columns.length === 0)
        throw new Error('no column observes a state yet: map at least one column to a state variable');
      if (!context.datasets) throw new Error('this runner cannot read stored datasets');
      const table = await context.datasets.table(cell.dataset.id);
      if (table.checksum !== cell.dataset.checksum)
        throw new Error(
          `the stored dataset does not match this cell (checksum ${table.checksum.slice(0, 12)}… instead of ${cell.dataset.checksum.slice(0, 12)}…): upload the file again`,
        );
      const observed = observedFromTable(
        table,
        { datasetId: cell.dataset.id, checksum: cell.dataset.checksum, name: cell.dataset.name },
        { timeColumn: cell.timeColumn, columns: cell.columns, groupColumn: cell.groupColumn },
      );
      return { kind: 'data', observed, finishedAt: new Date() };
    },
  },
};
