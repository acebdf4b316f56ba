import type { Cell, ProbeCell, SheetDocument } from '../sheet/document';
import type { SheetIssue } from '../sheet/issues';
import { wrongReference, type SheetIndex } from '../sheet/sheet-index';

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
