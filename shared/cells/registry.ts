import { z } from 'zod';
import type { Cell, CellKind } from '../sheet/document';
import type { CellKindDefinition } from './kind';
import { chartCellSchema, chartKind } from './chart';
import { dataCellSchema, dataKind } from './data';
import { fitCellSchema, fitKind } from './fit';
import { modelCellSchema, modelKind } from './model';
import { noteCellSchema, noteKind } from './note';
import { paramsCellSchema, paramsKind } from './params';
import { probeCellSchema, probeKind } from './probe';
import { simulationCellSchema, simulationKind } from './simulation';
import { scenariosCellSchema, scenariosKind } from './scenarios';
import { studyCellSchema, studyKind } from './study';
import { sweepCellSchema, sweepKind } from './sweep';

/**
 * Every cell kind, in the order the "Add cell" menu lists them. A new kind adds its schema to
 * `cellSchema` and its definition to `CELL_KINDS`; the type checker then asks for the rest
 * (its editor in src/components/cells/editors.ts).
 */
export const cellSchema = z.discriminatedUnion('kind', [
  noteCellSchema,
  paramsCellSchema,
  modelCellSchema,
  simulationCellSchema,
  chartCellSchema,
  probeCellSchema,
  studyCellSchema,
  dataCellSchema,
  fitCellSchema,
  scenariosCellSchema,
  sweepCellSchema,
]);

type Definitions = { [K in CellKind]: CellKindDefinition<K> };

export const CELL_KINDS: Definitions = {
  note: noteKind,
  params: paramsKind,
  model: modelKind,
  simulation: simulationKind,
  chart: chartKind,
  probe: probeKind,
  study: studyKind,
  data: dataKind,
  fit: fitKind,
  scenarios: scenariosKind,
  sweep: sweepKind,
};

/** The kinds in menu order. */
export const CELL_KIND_NAMES = Object.keys(CELL_KINDS) as CellKind[];

/** The definition of a cell's kind, typed for that cell. */
export function kindOf<C extends Cell>(cell: C): CellKindDefinition<C['kind']> {
  return CELL_KINDS[cell.kind] as unknown as CellKindDefinition<C['kind']>;
}
