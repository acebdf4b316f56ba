import type { Cell, ModelCell, Parameter, SheetDocument, SimulationCell } from '@shared/sheet/document';
import type { ScopeName } from './expressionCheck';

/** Every parameter of the sheet, in order, from all its parameter cells. */
export function sheetParameters(document: SheetDocument): Parameter[] {
  return document.cells.flatMap((cell) => (cell.kind === 'params' ? cell.params : []));
}

/** Names taken by the state variables and noise sources of the sheet's models. */
export function modelSymbolNames(document: SheetDocument): string[] {
  return document.cells.flatMap((cell) =>
    cell.kind === 'model' ? [...cell.states.map((s) => s.name), ...cell.noises.map((n) => n.name)] : [],
  );
}

export function cellsOfKind<K extends Cell['kind']>(
  document: SheetDocument,
  kind: K,
): Extract<Cell, { kind: K }>[] {
  return document.cells.filter((cell): cell is Extract<Cell, { kind: K }> => cell.kind === kind);
}

export function findModel(document: SheetDocument, id: string): ModelCell | undefined {
  return cellsOfKind(document, 'model').find((cell) => cell.id === id);
}

export function findSimulation(document: SheetDocument, id: string): SimulationCell | undefined {
  return cellsOfKind(document, 'simulation').find((cell) => cell.id === id);
}

/** The model a simulation cell simulates, if both exist. */
export function simulatedModel(document: SheetDocument, simulationId: string): ModelCell | undefined {
  const simulation = findSimulation(document, simulationId);
  return simulation ? findModel(document, simulation.model) : undefined;
}

/** The sheet's simulation cells as choices. */
export function simulationChoices(document: SheetDocument): { value: string; label: string }[] {
  return cellsOfKind(document, 'simulation').map((s) => ({ value: s.id, label: cellLabel(document, s) }));
}

/** The state variables of the model a simulation simulates, as choices (with their units). */
export function stateChoices(
  document: SheetDocument,
  simulationId: string,
): { value: string; label: string }[] {
  return (simulatedModel(document, simulationId)?.states ?? []).map((s) => ({
    value: s.name,
    label: s.unit ? `${s.name} (${s.unit})` : s.name,
  }));
}

/** What a person sees when choosing a cell: its name, else its kind and position. */
export function cellLabel(document: SheetDocument, cell: ModelCell | SimulationCell): string {
  if (cell.name) return cell.name;
  const index = cellsOfKind(document, cell.kind).indexOf(cell as never);
  return `${cell.kind === 'model' ? 'Model' : 'Simulation'} ${index + 1} (${cell.id})`;
}

function parameterDetail(param: Parameter): string {
  const value = typeof param.value === 'number' ? String(param.value) : `= ${param.value}`;
  return param.unit ? `${value} ${param.unit}` : value;
}

export function parameterScope(document: SheetDocument): ScopeName[] {
  return sheetParameters(document).map((p) => ({
    name: p.name,
    kind: 'parameter',
    detail: parameterDetail(p),
  }));
}

/** Names a drift or diffusion expression of `model` may use (besides the built-in functions). */
export function coefficientScope(document: SheetDocument, model: ModelCell): ScopeName[] {
  return [
    ...parameterScope(document),
    ...model.states.map((s): ScopeName => ({
      name: s.name,
      kind: 'state',
      detail: s.unit ? `state (${s.unit})` : 'state',
    })),
    { name: 't', kind: 'time', detail: 'time' },
  ];
}

/** Initial values are expressions of the parameters only. */
export function initialScope(document: SheetDocument): ScopeName[] {
  return parameterScope(document);
}

/**
 * An exact solution may use the parameters, t, each noise source's name for its Brownian motion
 * W_t, and each state's name for its initial value (see stateVariableSchema.exact).
 */
export function exactScope(document: SheetDocument, model: ModelCell): ScopeName[] {
  return [
    ...parameterScope(document),
    ...model.states.map((s): ScopeName => ({ name: s.name, kind: 'state', detail: 'initial value' })),
    ...model.noises.map((n): ScopeName => ({
      name: n.name,
      kind: 'noise',
      detail: `Brownian motion W_t of ${n.name}`,
    })),
    { name: 't', kind: 'time', detail: 'time' },
  ];
}
