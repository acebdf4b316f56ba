import { describe, expect, it } from 'vitest';
import {
  addNoise,
  correlationProblem,
  removeNoise,
  renameNoise,
  setCorrelationEntry,
} from '@/components/cells/modelEdits';
import type { ModelCell } from '@shared/sheet/document';

const model: ModelCell = {
  id: 'g',
  kind: 'model',
  states: [
    { name: 'P', initial: '1', drift: '0', diffusion: { U: '0.1 * P' } },
    { name: 'Q', initial: '1', drift: '0', diffusion: { V: '0.2 * Q' } },
  ],
  noises: [{ name: 'U' }, { name: 'V' }],
  correlation: [
    [1, 0.3],
    [0.3, 1],
  ],
  calculus: 'ito',
};

describe('model edits', () => {
  it('carries diffusion entries over when a noise source is renamed', () => {
    const next = renameNoise(model, 0, 'Rain');
    expect(next.noises[0]!.name).toBe('Rain');
    expect(next.states[0]!.diffusion).toEqual({ Rain: '0.1 * P' });
    expect(model.states[0]!.diffusion).toEqual({ U: '0.1 * P' }); // untouched
  });

  it('removes a noise source with its diffusion entries and correlation row and column', () => {
    const three = setCorrelationEntry(addNoise(model), 1, 2, -0.2);
    expect(three.correlation).toEqual([
      [1, 0.3, 0],
      [0.3, 1, -0.2],
      [0, -0.2, 1],
    ]);
    const two = removeNoise(three, 0);
    expect(two.correlation).toEqual([
      [1, -0.2],
      [-0.2, 1],
    ]);
    expect(two.states[0]!.diffusion).toEqual({});
    expect(removeNoise(model, 1).correlation).toBeUndefined();
  });

  it('accepts a positive definite correlation matrix and rejects inconsistent ones', () => {
    expect(correlationProblem(model.correlation!)).toBeNull();
    // ρ12 = ρ13 = 0.9, ρ23 = −0.9 has determinant 1 − 3·0.81 − 2·0.729 < 0 (by hand): not a
    // correlation matrix.
    expect(
      correlationProblem([
        [1, 0.9, 0.9],
        [0.9, 1, -0.9],
        [0.9, -0.9, 1],
      ]),
    ).toMatch(/positive definite/);
    expect(
      correlationProblem([
        [1, 1],
        [1, 1],
      ]),
    ).toMatch(/positive definite/);
    expect(
      correlationProblem([
        [1, 0.2],
        [0.3, 1],
      ]),
    ).toMatch(/symmetric/);
  });
});
