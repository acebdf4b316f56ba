import { z } from 'zod';
import { cellSchema } from '../cells/registry';

/**
 * The sheet document: what a version stores (jsonb) and what client, server, runner and engine
 * all read. One schema, validated on both sides; the cells' schemas come from the kind registry
 * (shared/cells). `schemaVersion` lets old versions stay readable once the format grows: readers
 * pass stored documents through `upgradeDocument` (./upgrade.ts) before validating them.
 */
export const SHEET_SCHEMA_VERSION = 1;

// Each kind's own schema lives in its module (shared/cells/<kind>.ts).
export { cellIdSchema, symbolNameSchema } from '../cells/fields';
export type { Method, BoundaryRule } from '../cells/simulation';
export type { ProbeQuantity } from '../cells/probe';
export { cellSchema };

export const sheetDocumentSchema = z.object({
  schemaVersion: z.literal(SHEET_SCHEMA_VERSION),
  title: z
    .string()
    .trim()
    .min(1, 'a sheet needs a title')
    .max(200, 'a sheet title is at most 200 characters'),
  cells: z.array(cellSchema).max(500, 'a sheet holds at most 500 cells'),
});

export type SheetDocument = z.infer<typeof sheetDocumentSchema>;
export type SheetDocumentInput = z.input<typeof sheetDocumentSchema>;
export type Cell = z.infer<typeof cellSchema>;
export type CellKind = Cell['kind'];
export type NoteCell = Extract<Cell, { kind: 'note' }>;
export type ParamsCell = Extract<Cell, { kind: 'params' }>;
export type Parameter = ParamsCell['params'][number];
export type ModelCell = Extract<Cell, { kind: 'model' }>;
export type StateVariable = ModelCell['states'][number];
export type SimulationCell = Extract<Cell, { kind: 'simulation' }>;
export type ChartCell = Extract<Cell, { kind: 'chart' }>;
export type ProbeCell = Extract<Cell, { kind: 'probe' }>;
export type StudyCell = Extract<Cell, { kind: 'study' }>;
export type DataCell = Extract<Cell, { kind: 'data' }>;
export type FitCell = Extract<Cell, { kind: 'fit' }>;
export type SweepCell = Extract<Cell, { kind: 'sweep' }>;
export type ScenariosCell = Extract<Cell, { kind: 'scenarios' }>;

export function emptySheetDocument(title: string): SheetDocument {
  return { schemaVersion: SHEET_SCHEMA_VERSION, title, cells: [] };
}
