import { EXPRESSION_PRELUDE } from '../expr';
import { compileGenerated } from '../engine/compile-generated';
import type { FitModelCode } from './problem';

/**
 * The fit's model as two compiled functions, built once per fit from sources that the expression
 * compiler generated from checked trees (build-problem.ts): nothing a person typed reaches here.
 * Runs only where eval is allowed (a worker, Node), like the simulation kernel.
 */
export interface CompiledFitModel {
  d: number;
  m: number;
  parameterCount: number;
  /** Writes every model parameter p0 … into `values` from the estimated ones in `theta`. */
  parameters(theta: ArrayLike<number>, values: Float64Array): void;
  /** Drift (d) and diffusion (d × m, row-major) at time t and state s, for parameter values pv. */
  coefficients(
    pv: Float64Array,
    t: number,
    s: Float64Array,
    drift: Float64Array,
    diffusion: Float64Array,
  ): void;
}

const range = (n: number) => Array.from({ length: n }, (_, i) => i);

export function compileFitModel(code: FitModelCode): CompiledFitModel {
  const d = code.stateNames.length;
  const m = code.noiseCount;
  const k = code.parameterCount;
  const readParams =
    k > 0
      ? `const ${range(k)
          .map((i) => `p${i} = pv[${i}]`)
          .join(', ')};`
      : '';
  const readStates = `const ${range(d)
    .map((i) => `s${i} = s[${i}]`)
    .join(', ')};`;
  const assignments = [
    ...code.drift.map((source, i) => `f[${i}] = ${source};`),
    ...code.diffusion.flatMap((row, i) => row.map((source, j) => `g[${i * m + j}] = ${source};`)),
  ].join('\n');
  const coefficients = compileGenerated<() => CompiledFitModel['coefficients']>(
    [],
    `"use strict"; ${EXPRESSION_PRELUDE}
return function coefficients(pv, t, s, f, g) { ${readParams} ${readStates}
${assignments}
};`,
  )();
  const writeParams = range(k)
    .map((i) => `values[${i}] = p${i};`)
    .join(' ');
  const parameters = compileGenerated<() => CompiledFitModel['parameters']>(
    [],
    `"use strict"; ${EXPRESSION_PRELUDE}
return function parameters(theta, values) { ${code.parameterBody} ${writeParams} };`,
  )();
  return { d, m, parameterCount: k, parameters, coefficients };
}

/** Σ = G R Gᵀ (d × d, row-major) from the diffusion G (d × m) and the noise correlation R. */
export function noiseCovariance(
  g: Float64Array,
  d: number,
  m: number,
  correlation: readonly (readonly number[])[] | null,
  out: Float64Array,
): void {
  for (let i = 0; i < d; i++)
    for (let j = 0; j <= i; j++) {
      let sum = 0;
      for (let a = 0; a < m; a++) {
        const gia = g[i * m + a]!;
        if (gia === 0) continue;
        if (correlation === null) sum += gia * g[j * m + a]!;
        else for (let b = 0; b < m; b++) sum += gia * correlation[a]![b]! * g[j * m + b]!;
      }
      out[i * d + j] = sum;
      out[j * d + i] = sum;
    }
}

/**
 * Cholesky factor L (lower, row-major) of a d × d covariance in place into `l`; returns the log
 * determinant, or NaN when the matrix is not positive definite.
 */
export function choleskyLogDet(cov: Float64Array, d: number, l: Float64Array): number {
  let logDet = 0;
  for (let i = 0; i < d; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = cov[i * d + j]!;
      for (let k = 0; k < j; k++) sum -= l[i * d + k]! * l[j * d + k]!;
      if (i === j) {
        if (!(sum > 0)) return Number.NaN;
        const root = Math.sqrt(sum);
        l[i * d + i] = root;
        logDet += 2 * Math.log(root);
      } else l[i * d + j] = sum / l[j * d + j]!;
    }
    for (let j = i + 1; j < d; j++) l[i * d + j] = 0;
  }
  return logDet;
}

/** ½|L⁻¹ r|² by forward substitution (the Gaussian's quadratic form), r read from `r`. */
export function halfMahalanobis(l: Float64Array, d: number, r: Float64Array, work: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < d; i++) {
    let v = r[i]!;
    for (let k = 0; k < i; k++) v -= l[i * d + k]! * work[k]!;
    v /= l[i * d + i]!;
    work[i] = v;
    sum += v * v;
  }
  return 0.5 * sum;
}

export const HALF_LOG_2PI = 0.5 * Math.log(2 * Math.PI);
