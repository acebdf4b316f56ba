/**
 * Cholesky factor L (lower triangular, L·Lᵀ = C) of a noise correlation matrix, so correlated
 * increments are dW = L·z·√h with independent standard normals z. Checks the matrix once, outside
 * any loop, and says plainly what is wrong.
 */
export function choleskyOfCorrelation(correlation: number[][], noiseCount: number): Float64Array {
  if (correlation.length !== noiseCount || correlation.some((row) => row.length !== noiseCount)) {
    throw new RangeError(
      `the noise correlation matrix must be ${noiseCount} × ${noiseCount}, one row and column per noise source`,
    );
  }
  for (let i = 0; i < noiseCount; i++) {
    for (let j = 0; j < noiseCount; j++) {
      const c = correlation[i]![j]!;
      if (!Number.isFinite(c))
        throw new RangeError(
          `the noise correlation matrix has a non-finite entry at row ${i + 1}, column ${j + 1}`,
        );
      if (i === j && Math.abs(c - 1) > 1e-12)
        throw new RangeError(`a correlation matrix has 1 on its diagonal; row ${i + 1} has ${c}`);
      if (Math.abs(c - correlation[j]![i]!) > 1e-12) {
        throw new RangeError(
          `the noise correlation matrix must be symmetric; entries (${i + 1}, ${j + 1}) and (${j + 1}, ${i + 1}) differ`,
        );
      }
      if (Math.abs(c) > 1)
        throw new RangeError(`a correlation lies in [−1, 1]; entry (${i + 1}, ${j + 1}) is ${c}`);
    }
  }
  const factor = new Float64Array(noiseCount * noiseCount);
  for (let i = 0; i < noiseCount; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = correlation[i]![j]!;
      for (let k = 0; k < j; k++) sum -= factor[i * noiseCount + k]! * factor[j * noiseCount + k]!;
      if (i === j) {
        // A pivot at or below ~1e-12 means the matrix is singular or indefinite.
        if (!(sum > 1e-12)) {
          throw new RangeError(
            'the noise correlation matrix is not positive definite (some combination of the noise sources would have zero or negative variance); reduce the correlations',
          );
        }
        factor[i * noiseCount + i] = Math.sqrt(sum);
      } else {
        factor[i * noiseCount + j] = sum / factor[j * noiseCount + j]!;
      }
    }
  }
  return factor;
}
