import { describe, expect, it } from 'vitest';
import { meanSquareStability } from '@shared/engine/stability';
import { makePlan } from './plans';

describe('stability report for a model whose own second moment grows', () => {
  // dX = λX dt + μX dW has E[X_t²] = X0² exp((2λ + μ²) t) (Itô; Kloeden & Platen 1992, §4.4),
  // so with 2λ + μ² ≥ 0 no step size can make a scheme mean-square stable (Higham 2000, §2).
  it('does not blame the step when 2λ + μ² ≥ 0', () => {
    const report = meanSquareStability(
      makePlan({
        drift: ['0.04 * s0'],
        diffusion: [['0.3 * s0']],
        initial: [1],
        t1: 1,
        steps: 100,
        paths: 1,
      }),
    );
    expect(report).not.toBeNull();
    expect(report!.stable).toBe(false);
    expect(report!.modelStable).toBe(false);
    expect(report!.message).not.toMatch(/Try a smaller step/);
    expect(report!.message).toMatch(/own second moment grows/);
  });

  it('blames the step when the model decays but the scheme does not (λ = −3, μ = √3, h = 1/2; Higham 2000)', () => {
    const report = meanSquareStability(
      makePlan({
        drift: ['-3 * s0'],
        diffusion: [[`${Math.sqrt(3)} * s0`]],
        initial: [1],
        t1: 2,
        steps: 4,
        paths: 1,
      }),
    );
    expect(report!.stable).toBe(false);
    expect(report!.modelStable).toBe(true);
    expect(report!.message).toMatch(/Try a smaller step/);
  });
});
