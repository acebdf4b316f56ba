import type { Cell, CellKind, ModelCell, SheetDocument, SimulationCell } from '@shared/sheet/document';

/**
 * Pure operations on the cell list: default cells of each kind, insert, move, duplicate, delete.
 * Each returns a new document; the store keeps the result.
 */

export const CELL_KIND_LABELS: Record<CellKind, string> = {
  note: 'Note',
  params: 'Parameters',
  model: 'Model',
  simulation: 'Simulation',
  chart: 'Chart',
  probe: 'Probe',
  study: 'Step-size study',
};

/** Lower-case words for aria-labels: "Delete model cell". */
export const CELL_KIND_WORDS: Record<CellKind, string> = {
  note: 'note',
  params: 'parameters',
  model: 'model',
  simulation: 'simulation',
  chart: 'chart',
  probe: 'probe',
  study: 'step-size study',
};

export const CELL_KINDS: readonly CellKind[] = [
  'note',
  'params',
  'model',
  'simulation',
  'chart',
  'probe',
  'study',
];

function randomHex(): string {
  const uuid = globalThis.crypto?.randomUUID?.();
  if (uuid) return uuid.replace(/-/g, '').slice(0, 8);
  return Math.floor(Math.random() * 0xffffffff)
    .toString(16)
    .padStart(8, '0');
}

/** A fresh cell id with a kind prefix, e.g. "model-3f9a01c2", unused in the document. */
export function newCellId(kind: CellKind, doc: SheetDocument): string {
  const taken = new Set(doc.cells.map((cell) => cell.id));
  for (;;) {
    const id = `${kind}-${randomHex()}`;
    if (!taken.has(id)) return id;
  }
}

/** Every name a sheet defines: parameters, state variables, noise sources. */
export function namesInUse(doc: SheetDocument): Set<string> {
  const names = new Set<string>();
  for (const cell of doc.cells) {
    if (cell.kind === 'params') cell.params.forEach((param) => names.add(param.name));
    if (cell.kind === 'model') {
      cell.states.forEach((state) => names.add(state.name));
      cell.noises.forEach((noise) => names.add(noise.name));
    }
  }
  return names;
}

function freshName(base: string, taken: Set<string>): string {
  if (!taken.has(base)) return base;
  for (let n = 2; ; n++) if (!taken.has(`${base}${n}`)) return `${base}${n}`;
}

/** The nearest cell of a kind above `index`, else the first one below it. */
export function nearestCell<K extends CellKind>(
  doc: SheetDocument,
  kind: K,
  index: number,
): Extract<Cell, { kind: K }> | undefined {
  const isKind = (cell: Cell): cell is Extract<Cell, { kind: K }> => cell.kind === kind;
  for (let i = Math.min(index, doc.cells.length) - 1; i >= 0; i--) {
    const cell = doc.cells[i]!;
    if (isKind(cell)) return cell;
  }
  return doc.cells.slice(index).find(isKind);
}

function firstStateOf(doc: SheetDocument, simulation: SimulationCell | undefined): string {
  const model = doc.cells.find(
    (cell): cell is ModelCell => cell.kind === 'model' && cell.id === simulation?.model,
  );
  return model?.states[0]?.name ?? 'x';
}

/** Why a kind cannot be added at `index` yet, or null when it can. */
export function cannotAddReason(doc: SheetDocument, kind: CellKind, index: number): string | null {
  if (kind === 'simulation' && !nearestCell(doc, 'model', index)) return 'add a model first';
  if ((kind === 'chart' || kind === 'probe' || kind === 'study') && !nearestCell(doc, 'simulation', index)) {
    return 'add a simulation first';
  }
  return null;
}

/**
 * A sensible new cell of `kind` to be inserted at `index`: names that clash with nothing, and
 * references to the nearest model or simulation above.
 */
export function defaultCell(kind: CellKind, doc: SheetDocument, index: number): Cell {
  const id = newCellId(kind, doc);
  const taken = namesInUse(doc);
  switch (kind) {
    case 'note':
      return { id, kind, text: 'Write what this part of the sheet is for.' };
    case 'params':
      return {
        id,
        kind,
        params: [{ name: freshName('k', taken), value: 1, description: 'a new parameter' }],
      };
    case 'model': {
      const state = freshName('x', taken);
      const noise = freshName('W', new Set([...taken, state]));
      const modelCount = doc.cells.filter((cell) => cell.kind === 'model').length;
      return {
        id,
        kind,
        name: modelCount === 0 ? 'New model' : `New model ${modelCount + 1}`,
        states: [{ name: state, initial: '1', drift: `-${state}`, diffusion: { [noise]: '0.2' } }],
        noises: [{ name: noise }],
        calculus: 'ito',
      };
    }
    case 'simulation': {
      const model = nearestCell(doc, 'model', index);
      return {
        id,
        kind,
        model: model?.id ?? 'model',
        method: 'euler-maruyama',
        t0: 0,
        t1: 10,
        steps: 1000,
        paths: 1000,
        seed: Math.floor(Math.random() * 0xffffffff),
        saveCount: 101,
        samplePaths: 20,
        boundaries: {},
        overrides: {},
      };
    }
    case 'chart': {
      const simulation = nearestCell(doc, 'simulation', index);
      return {
        id,
        kind,
        simulation: simulation?.id ?? 'simulation',
        view: 'fan',
        state: firstStateOf(doc, simulation),
      };
    }
    case 'probe': {
      const simulation = nearestCell(doc, 'simulation', index);
      return {
        id,
        kind,
        simulation: simulation?.id ?? 'simulation',
        quantity: 'mean',
        state: firstStateOf(doc, simulation),
      };
    }
    case 'study': {
      const simulation = nearestCell(doc, 'simulation', index);
      return {
        id,
        kind,
        simulation: simulation?.id ?? 'simulation',
        levels: 5,
        coarsestSteps: 8,
        paths: 2000,
        state: firstStateOf(doc, simulation),
        reference: 'auto',
      };
    }
  }
}

export function insertCell(doc: SheetDocument, index: number, cell: Cell): SheetDocument {
  const cells = [...doc.cells];
  cells.splice(Math.max(0, Math.min(index, cells.length)), 0, cell);
  return { ...doc, cells };
}

export function replaceCell(doc: SheetDocument, cell: Cell): SheetDocument {
  return { ...doc, cells: doc.cells.map((existing) => (existing.id === cell.id ? cell : existing)) };
}

/** Moves a cell by `delta` places (−1 up, +1 down); unchanged at the ends. */
export function moveCell(doc: SheetDocument, cellId: string, delta: number): SheetDocument {
  const from = doc.cells.findIndex((cell) => cell.id === cellId);
  const to = from + delta;
  if (from < 0 || to < 0 || to >= doc.cells.length) return doc;
  const cells = [...doc.cells];
  const [moved] = cells.splice(from, 1);
  cells.splice(to, 0, moved!);
  return { ...doc, cells };
}

/** A copy with a new id, placed right below the original. */
export function duplicateCell(doc: SheetDocument, cellId: string): { doc: SheetDocument; copy: Cell | null } {
  const index = doc.cells.findIndex((cell) => cell.id === cellId);
  if (index < 0) return { doc, copy: null };
  const original = doc.cells[index]!;
  // JSON copy: the document is plain JSON, and reactive proxies cannot go through structuredClone.
  const copy = {
    ...(JSON.parse(JSON.stringify(original)) as Cell),
    id: newCellId(original.kind, doc),
  } as Cell;
  return { doc: insertCell(doc, index + 1, copy), copy };
}

export interface RemovedCell {
  cell: Cell;
  index: number;
}

export function removeCell(
  doc: SheetDocument,
  cellId: string,
): { doc: SheetDocument; removed: RemovedCell | null } {
  const index = doc.cells.findIndex((cell) => cell.id === cellId);
  if (index < 0) return { doc, removed: null };
  return {
    doc: { ...doc, cells: doc.cells.filter((cell) => cell.id !== cellId) },
    removed: { cell: doc.cells[index]!, index },
  };
}
