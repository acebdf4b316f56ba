import type { ModelCell, StateVariable } from '@shared/sheet/document';

/** Pure edits of a model cell; each returns a new cell and leaves the given one untouched. */

export function replaceState(model: ModelCell, index: number, state: StateVariable): ModelCell {
  return { ...model, states: model.states.map((s, i) => (i === index ? state : s)) };
}

export function addState(model: ModelCell): ModelCell {
  const taken = new Set(model.states.map((s) => s.name));
  let n = model.states.length + 1;
  while (taken.has(`X${n}`)) n += 1;
  return { ...model, states: [...model.states, { name: `X${n}`, initial: '0', drift: '0', diffusion: {} }] };
}

export function removeState(model: ModelCell, index: number): ModelCell {
  return { ...model, states: model.states.filter((_, i) => i !== index) };
}

/** Renaming a noise source carries every state's diffusion entry over to the new name. */
export function renameNoise(model: ModelCell, index: number, name: string): ModelCell {
  const old = model.noises[index]?.name;
  if (old === undefined || old === name) return model;
  return {
    ...model,
    noises: model.noises.map((n, i) => (i === index ? { ...n, name } : n)),
    states: model.states.map((s) => {
      if (!(old in s.diffusion)) return s;
      const { [old]: moved, ...rest } = s.diffusion;
      return { ...s, diffusion: { ...rest, [name]: moved! } };
    }),
  };
}

export function addNoise(model: ModelCell): ModelCell {
  const taken = new Set(model.noises.map((n) => n.name));
  let n = model.noises.length + 1;
  while (taken.has(`W${n}`)) n += 1;
  const next = { ...model, noises: [...model.noises, { name: `W${n}` }] };
  return next.correlation
    ? { ...next, correlation: resizeCorrelation(next.correlation, next.noises.length) }
    : next;
}

/** Removing a noise source drops its diffusion entries and its row and column of the correlation. */
export function removeNoise(model: ModelCell, index: number): ModelCell {
  const name = model.noises[index]?.name;
  const noises = model.noises.filter((_, i) => i !== index);
  const states = model.states.map((s) => {
    if (name === undefined || !(name in s.diffusion)) return s;
    const { [name]: _dropped, ...rest } = s.diffusion;
    return { ...s, diffusion: rest };
  });
  const next: ModelCell = { ...model, noises, states };
  if (!model.correlation) return next;
  if (noises.length < 2) {
    const { correlation: _unused, ...withoutCorrelation } = next;
    return withoutCorrelation;
  }
  return {
    ...next,
    correlation: model.correlation
      .filter((_, i) => i !== index)
      .map((row) => row.filter((_, j) => j !== index)),
  };
}

/** Keeps the entries that still fit; new rows and columns are uncorrelated. */
export function resizeCorrelation(matrix: number[][], size: number): number[][] {
  return Array.from({ length: size }, (_, i) =>
    Array.from({ length: size }, (_, j) => (i === j ? 1 : (matrix[i]?.[j] ?? 0))),
  );
}

export function setCorrelated(model: ModelCell, correlated: boolean): ModelCell {
  if (correlated)
    return { ...model, correlation: resizeCorrelation(model.correlation ?? [], model.noises.length) };
  const { correlation: _unused, ...rest } = model;
  return rest;
}

/** Sets ρ_ij and ρ_ji together: a correlation matrix is symmetric. */
export function setCorrelationEntry(model: ModelCell, i: number, j: number, value: number): ModelCell {
  const matrix = resizeCorrelation(model.correlation ?? [], model.noises.length);
  matrix[i]![j] = value;
  matrix[j]![i] = value;
  return { ...model, correlation: matrix };
}

/**
 * Why a matrix cannot be a correlation matrix, or null. Positive definiteness is tested by
 * attempting a Cholesky factorisation (Golub & Van Loan, Matrix Computations, §4.2), which is also
 * what the engine needs to correlate the noise.
 */
export function correlationProblem(matrix: readonly (readonly number[])[]): string | null {
  const m = matrix.length;
  for (let i = 0; i < m; i += 1) {
    if (matrix[i]!.length !== m) return 'The correlation matrix must be square.';
    if (matrix[i]![i] !== 1) return 'Each noise source has correlation 1 with itself.';
    for (let j = 0; j < m; j += 1) {
      const value = matrix[i]![j]!;
      if (!(Math.abs(value) <= 1)) return `Correlations lie between −1 and 1 (found ${value}).`;
      if (value !== matrix[j]![i]) return 'The correlation matrix must be symmetric.';
    }
  }
  const lower: number[][] = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  for (let j = 0; j < m; j += 1) {
    let diagonal = matrix[j]![j]!;
    for (let k = 0; k < j; k += 1) diagonal -= lower[j]![k]! ** 2;
    // A tiny tolerance: ±1 off the diagonal (perfectly correlated sources) is singular, not allowed.
    if (diagonal <= 1e-12) {
      return 'These correlations are not consistent (the matrix is not positive definite): lower some of them, or use one noise source for perfectly correlated effects.';
    }
    lower[j]![j] = Math.sqrt(diagonal);
    for (let i = j + 1; i < m; i += 1) {
      let sum = matrix[i]![j]!;
      for (let k = 0; k < j; k += 1) sum -= lower[i]![k]! * lower[j]![k]!;
      lower[i]![j] = sum / lower[j]![j]!;
    }
  }
  return null;
}
