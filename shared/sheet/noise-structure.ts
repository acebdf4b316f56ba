import { checkExpression } from '../expr';
import type { ModelCell } from './document';

/** felt[i][j]: state i has a diffusion entry for noise j that is not the literal 0. */
export function feltNoises(model: ModelCell): boolean[][] {
  return model.states.map((state) =>
    model.noises.map((noise) => {
      if (!Object.hasOwn(state.diffusion, noise.name)) return false;
      const checked = checkExpression(state.diffusion[noise.name] ?? '', []);
      return !(checked.ok && checked.tree.root.kind === 'number' && checked.tree.root.value === 0);
    }),
  );
}

/**
 * Noise structure Milstein handles in its derivative-free form: scalar noise (one source), or
 * diagonal noise (each state feels at most one source, and no source drives two states).
 * Kloeden & Platen 1992, §10.3 (Milstein scheme) and §11.1 (derivative-free form).
 */
export function hasDiagonalOrScalarNoise(model: ModelCell): boolean {
  if (model.noises.length <= 1) return true;
  const felt = feltNoises(model);
  if (felt.some((row) => row.filter(Boolean).length > 1)) return false;
  return model.noises.every((_, j) => felt.filter((row) => row[j]).length <= 1);
}
