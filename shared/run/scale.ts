import type { SheetDocument } from '../sheet/document';

/**
 * A copy of the sheet with every simulation's and study's path count multiplied by `factor`
 * (at least 1 path, and at least the study minimum of 10), and the path counts a sweep or a
 * scenarios cell sets for itself (at least 10). For quick looks and tests; the digest
 * of a scaled run naturally differs from the full run's.
 */
export const MIN_STUDY_PATHS = 10;

export function scaleSheetPaths(doc: SheetDocument, factor: number): SheetDocument {
  if (!Number.isFinite(factor) || factor <= 0)
    throw new RangeError(`the path scale must be a positive number, got ${factor}`);
  return {
    ...doc,
    cells: doc.cells.map((cell) => {
      if (cell.kind === 'simulation') return { ...cell, paths: Math.max(1, Math.round(cell.paths * factor)) };
      if (cell.kind === 'study')
        return { ...cell, paths: Math.max(MIN_STUDY_PATHS, Math.round(cell.paths * factor)) };
      const scaled = (paths: number) => Math.max(MIN_STUDY_PATHS, Math.round(paths * factor));
      if (cell.kind === 'scenarios' && cell.paths !== undefined)
        return { ...cell, paths: scaled(cell.paths) };
      if (cell.kind === 'sweep') {
        const refinePaths = cell.target?.refinePaths;
        return {
          ...cell,
          ...(cell.paths === undefined ? {} : { paths: scaled(cell.paths) }),
          ...(cell.target && refinePaths !== undefined
            ? { target: { ...cell.target, refinePaths: scaled(refinePaths) } }
            : {}),
        };
      }
      return cell;
    }),
  };
}
