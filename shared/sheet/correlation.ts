import type { SheetIssue } from './issues';

/** Slack for the unit diagonal and symmetry: entries are typed by people, to a few decimals. */
const ENTRY_TOLERANCE = 1e-12;
/** Smallest Cholesky pivot accepted; below it the matrix is singular to working precision. */
const PIVOT_TOLERANCE = 1e-12;

/**
 * Checks a noise correlation matrix for m sources: m × m, finite, symmetric, unit diagonal,
 * entries in [−1, 1] and positive definite (a Cholesky factorisation exists; Golub & Van Loan,
 * Matrix Computations, §4.2).
 */
export function checkCorrelation(
  cellId: string,
  matrix: readonly (readonly number[])[],
  m: number,
): SheetIssue[] {
  const at = (...path: (string | number)[]) => ['correlation', ...path];
  if (matrix.length !== m || matrix.some((row) => row.length !== m)) {
    return [
      {
        cellId,
        path: at(),
        message: `the correlation matrix must be ${m} × ${m}: one row and one column per noise source`,
      },
    ];
  }
  const issues: SheetIssue[] = [];
  for (let i = 0; i < m; i++) {
    const row = matrix[i] ?? [];
    for (let j = 0; j < m; j++) {
      const value = row[j] ?? Number.NaN;
      if (i === j) {
        if (Math.abs(value - 1) > ENTRY_TOLERANCE) {
          issues.push({ cellId, path: at(i, j), message: `diagonal entry (${i + 1}, ${i + 1}) must be 1` });
        }
      } else if (!(value >= -1 && value <= 1)) {
        issues.push({
          cellId,
          path: at(i, j),
          message: `entry (${i + 1}, ${j + 1}) must lie between −1 and 1`,
        });
      } else if (j > i && Math.abs(value - (matrix[j]?.[i] ?? Number.NaN)) > ENTRY_TOLERANCE) {
        issues.push({
          cellId,
          path: at(i, j),
          message: `entries (${i + 1}, ${j + 1}) and (${j + 1}, ${i + 1}) differ; the correlation matrix must be symmetric`,
        });
      }
    }
  }
  if (issues.length === 0 && !isPositiveDefinite(matrix)) {
    issues.push({ cellId, path: at(), message: 'the correlation matrix is not positive definite' });
  }
  return issues;
}

/** Cholesky–Banachiewicz on the lower triangle; fails exactly when a pivot is not positive. */
export function isPositiveDefinite(matrix: readonly (readonly number[])[]): boolean {
  const n = matrix.length;
  const lower = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = matrix[i]?.[j] ?? Number.NaN;
      for (let k = 0; k < j; k++) sum -= (lower[i * n + k] ?? 0) * (lower[j * n + k] ?? 0);
      if (i === j) {
        if (!(sum > PIVOT_TOLERANCE)) return false;
        lower[i * n + i] = Math.sqrt(sum);
      } else {
        lower[i * n + j] = sum / (lower[j * n + j] ?? Number.NaN);
      }
    }
  }
  return true;
}

/** True when the matrix is the identity (independent sources), so it can be dropped. */
export function isIdentity(matrix: readonly (readonly number[])[]): boolean {
  return matrix.every((row, i) => row.every((value, j) => value === (i === j ? 1 : 0)));
}
