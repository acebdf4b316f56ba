import { Matrix, inverse } from 'ml-matrix';

/**
 * e^A of a small square matrix by scaling and squaring with a diagonal Padé approximant of
 * degree 6 (Golub & Van Loan 1996, Matrix Computations, Algorithm 11.3.1; Moler & Van Loan 2003,
 * SIAM Review 45, method 3). Used once per distinct observation interval, not per transition.
 */
export function matrixExponential(a: Matrix): Matrix {
  const n = a.rows;
  const norm = Math.max(...a.to2DArray().map((row) => row.reduce((sum, x) => sum + Math.abs(x), 0)));
  const j = norm > 0 ? Math.max(0, 1 + Math.floor(Math.log2(norm))) : 0;
  const scaled = a.clone().mul(1 / 2 ** j);
  const q = 6;
  let c = 1;
  let x = Matrix.eye(n);
  let numerator = Matrix.eye(n);
  let denominator = Matrix.eye(n);
  for (let k = 1; k <= q; k++) {
    c = (c * (q - k + 1)) / (k * (2 * q - k + 1));
    x = scaled.mmul(x);
    numerator = numerator.add(x.clone().mul(c));
    denominator = denominator.add(x.clone().mul(k % 2 === 0 ? c : -c));
  }
  let f = inverse(denominator).mmul(numerator);
  for (let k = 0; k < j; k++) f = f.mmul(f);
  return f;
}
