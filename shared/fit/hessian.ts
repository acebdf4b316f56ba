import { CholeskyDecomposition, EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';

/**
 * The observed information: the Hessian of the negative log-likelihood at the estimate by
 * central differences (Dennis & Schnabel 1996, Numerical Methods for Unconstrained Optimization,
 * §5.6), inverted with ml-matrix for the covariance of the estimates (asymptotic theory of
 * maximum likelihood, e.g. Pawitan 2001, In All Likelihood, §8.3).
 */
export function numericalHessian(
  f: (x: number[]) => number,
  x: readonly number[],
  h: readonly number[],
): Matrix {
  const n = x.length;
  const at = (steps: [number, number][]) => {
    const point = [...x];
    for (const [i, s] of steps) point[i] = point[i]! + s * h[i]!;
    return f(point);
  };
  const centre = f([...x]);
  const hessian = Matrix.zeros(n, n);
  for (let i = 0; i < n; i++) {
    hessian.set(i, i, (at([[i, 1]]) - 2 * centre + at([[i, -1]])) / (h[i]! * h[i]!));
    for (let j = 0; j < i; j++) {
      const value =
        (at([
          [i, 1],
          [j, 1],
        ]) -
          at([
            [i, 1],
            [j, -1],
          ]) -
          at([
            [i, -1],
            [j, 1],
          ]) +
          at([
            [i, -1],
            [j, -1],
          ])) /
        (4 * h[i]! * h[j]!);
      hessian.set(i, j, value);
      hessian.set(j, i, value);
    }
  }
  return hessian;
}

/**
 * The smallest eigenvalue of the information scaled to a unit diagonal below which it counts as
 * singular: the likelihood is then flat along some combination of parameters (two estimates
 * correlated beyond 0.99999 have 1 − 0.99999), whatever the parameters' units. Central
 * differences leave noise of about 1e-7 there on an exactly flat direction, so a smaller value
 * could not be told from one.
 */
const SINGULAR = 1e-5;

/** The inverse of a positive definite information matrix, or null (flat or not at a maximum). */
export function covarianceFromInformation(information: Matrix): Matrix | null {
  const values = information.to1DArray();
  if (!values.every(Number.isFinite)) return null;
  if (!new CholeskyDecomposition(information).isPositiveDefinite()) return null;
  const n = information.rows;
  const scale = Array.from({ length: n }, (_, i) => 1 / Math.sqrt(information.get(i, i)));
  const unit = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) unit.set(i, j, information.get(i, j) * scale[i]! * scale[j]!);
  const smallest = Math.min(...new EigenvalueDecomposition(unit, { assumeSymmetric: true }).realEigenvalues);
  if (!(smallest > SINGULAR)) return null;
  return inverse(information);
}
