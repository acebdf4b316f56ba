import type { FitParameter } from './problem';

/**
 * Bounds by transformation: the optimiser searches over unbounded z, and each parameter is a
 * smooth one-to-one function of its z that stays strictly inside the params cell's bounds
 * (logistic between two bounds, exponential above a lower or below an upper bound).
 */
export interface Transform {
  toParameter(z: number): number;
  toSearch(value: number): number;
}

export function transformFor(parameter: Pick<FitParameter, 'lower' | 'upper'>): Transform {
  const { lower, upper } = parameter;
  if (lower !== null && upper !== null) {
    const width = upper - lower;
    return {
      toParameter: (z) => lower + width / (1 + Math.exp(-z)),
      toSearch: (value) => Math.log((value - lower) / (upper - value)),
    };
  }
  if (lower !== null)
    return { toParameter: (z) => lower + Math.exp(z), toSearch: (value) => Math.log(value - lower) };
  if (upper !== null)
    return { toParameter: (z) => upper - Math.exp(z), toSearch: (value) => Math.log(upper - value) };
  return { toParameter: (z) => z, toSearch: (value) => value };
}

/** Why a starting value cannot be used, or null: it must lie strictly inside its bounds. */
export function startProblem(parameter: FitParameter): string | null {
  const { name, start, lower, upper } = parameter;
  if (!Number.isFinite(start)) return `the starting value of ${name} is not a finite number`;
  if (lower !== null && upper !== null && !(lower < upper))
    return `the bounds of ${name} leave no room: its minimum ${lower} is not below its maximum ${upper}`;
  if (lower !== null && !(start > lower))
    return `the starting value of ${name} (${start}) is on or below its minimum ${lower}; start it inside its range in the parameters cell`;
  if (upper !== null && !(start < upper))
    return `the starting value of ${name} (${start}) is on or above its maximum ${upper}; start it inside its range in the parameters cell`;
  return null;
}
