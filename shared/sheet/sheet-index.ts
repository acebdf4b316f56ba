import { TIME_NAME } from './names';
import type { Cell, ModelCell, Parameter, ParamsCell, SheetDocument, SimulationCell } from './document';

export interface ParameterEntry {
  cellId: string;
  index: number;
  parameter: Parameter;
}

/** Look-ups over a document that every check needs; the first cell or parameter of a name wins. */
export interface SheetIndex {
  doc: SheetDocument;
  cellsById: ReadonlyMap<string, Cell>;
  paramsCells: readonly ParamsCell[];
  parameters: ReadonlyMap<string, ParameterEntry>;
  parameterNames: readonly string[];
}

export function indexSheet(doc: SheetDocument): SheetIndex {
  const cellsById = new Map<string, Cell>();
  const paramsCells: ParamsCell[] = [];
  const parameters = new Map<string, ParameterEntry>();
  for (const cell of doc.cells) {
    if (!cellsById.has(cell.id)) cellsById.set(cell.id, cell);
    if (cell.kind !== 'params') continue;
    paramsCells.push(cell);
    cell.params.forEach((parameter, index) => {
      if (!parameters.has(parameter.name))
        parameters.set(parameter.name, { cellId: cell.id, index, parameter });
    });
  }
  return { doc, cellsById, paramsCells, parameters, parameterNames: [...parameters.keys()] };
}

export function findModel(index: SheetIndex, id: string): ModelCell | undefined {
  const cell = index.cellsById.get(id);
  return cell?.kind === 'model' ? cell : undefined;
}

export function findSimulation(index: SheetIndex, id: string): SimulationCell | undefined {
  const cell = index.cellsById.get(id);
  return cell?.kind === 'simulation' ? cell : undefined;
}

/** "there is no cell 'x'" or "cell 'x' is a chart cell, not a model cell". */
export function wrongReference(index: SheetIndex, id: string, wanted: Cell['kind']): string {
  const cell = index.cellsById.get(id);
  if (!cell) return `there is no cell '${id}'`;
  return `cell '${id}' is a ${cell.kind} cell, not a ${wanted} cell`;
}

/** Scopes of the expressions in a model (see the field comments in document.ts). */
export function modelScopes(index: SheetIndex, model: ModelCell) {
  const states = model.states.map((s) => s.name);
  const noises = model.noises.map((n) => n.name);
  const params = index.parameterNames;
  return {
    initial: [...params],
    coefficient: [...params, ...states, TIME_NAME],
    exact: [...params, TIME_NAME, ...noises, ...states],
  };
}
