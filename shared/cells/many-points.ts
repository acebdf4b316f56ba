import type { Cell, ProbeCell, SheetDocument, SimulationCell } from '../sheet/document';
import type { SheetIssue } from '../sheet/issues';
import { wrongReference, type SheetIndex } from '../sheet/sheet-index';
import { MAX_PATHS } from '../engine/limits';

/** Look-ups and checks the sweep and scenarios kinds share. */

export function probeCellOf(doc: SheetDocument, id: string): ProbeCell | undefined {
  const cell = doc.cells.find((c: Cell) => c.id === id);
  return cell?.kind === 'probe' ? cell : undefined;
}

/**
 * Each probe id names a probe cell; with `simulationId`, each reads that simulation. Problems go
 * on `path` (with the probe's position appended when `indexed`).
 */
export function checkManyPoints(
  index: SheetIndex,
  cellId: string,
  probeIds: readonly string[],
  simulationId: string | null,
  path: (string | number)[],
  indexed = false,
): SheetIssue[] {
  const issues: SheetIssue[] = [];
  probeIds.forEach((id, k) => {
    const at = indexed ? [...path, k] : path;
    const cell = index.cellsById.get(id);
    if (cell?.kind !== 'probe') {
      issues.push({ cellId, path: at, message: wrongReference(index, id, 'probe') });
    } else if (simulationId !== null && cell.simulation !== simulationId) {
      issues.push({
        cellId,
        path: at,
        message: `the probe '${id}' reads another simulation ('${cell.simulation}'), not '${simulationId}'`,
      });
    }
  });
  return issues;
}

/** Overrides that name no parameter of the sheet, as issues at `path` + the name. */
export function checkOverrideNames(
  index: SheetIndex,
  cellId: string,
  overrides: Readonly<Record<string, number>>,
  path: (string | number)[],
): SheetIssue[] {
  const names = [...index.parameters.keys()];
  return Object.keys(overrides)
    .filter((name) => !index.parameters.has(name))
    .map((name) => ({
      cellId,
      path: [...path, name],
      message: `there is no parameter '${name}'${names.length > 0 ? `; the sheet's parameters are: ${names.join(', ')}` : ''}`,
    }));
}

/**
 * Paths a sweep or scenarios cell runs in all (every point, and a target search's refined runs
 * at most), and the simulation whose steps each path takes; null when the cell names none.
 */
export function manyPointWork(
  doc: SheetDocument,
  cell: Extract<Cell, { kind: 'sweep' | 'scenarios' }>,
): { simulation: SimulationCell; paths: number } | null {
  const simulationId = cell.kind === 'scenarios' ? cell.simulation : probeCellOf(doc, cell.probe)?.simulation;
  const simulation = doc.cells.find(
    (c): c is SimulationCell => c.kind === 'simulation' && c.id === simulationId,
  );
  if (!simulation) return null;
  const paths = cell.paths ?? simulation.paths;
  if (cell.kind === 'scenarios') return { simulation, paths: cell.scenarios.length * paths };
  const points = cell.axes.reduce(
    (product, axis) => product * (axis.spacing === 'list' ? axis.values.length : axis.count),
    1,
  );
  const refined = cell.target ? cell.target.refineRuns * refinePathsOf(cell.target, paths) : 0;
  return { simulation, paths: points * paths + refined };
}

/** Paths of each refined run of a target search: as set, else four times the sweep's. */
export function refinePathsOf(target: { refinePaths?: number }, paths: number): number {
  return target.refinePaths ?? Math.min(4 * paths, MAX_PATHS);
}
