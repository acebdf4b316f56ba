/** The cell kinds: one module each (schema, defaults, label, colour, reads, checks, run step). */
export { CELL_KINDS, CELL_KIND_NAMES, cellSchema, kindOf } from './registry';
export type {
  CellKindDefinition,
  CheckContext,
  NewCellContext,
  ReadsContext,
  RunExecutor,
  RunStepContext,
  CellRunStep,
} from './kind';
export { EDGE_COLOURS, type EdgeColour } from './colours';
export { probeRequest } from './probe';
export { studyOptions } from './study';
