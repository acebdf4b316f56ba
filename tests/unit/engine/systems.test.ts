import { describe, expect, it } from 'vitest';
import { simulate } from '@shared/engine/simulate';
import { runStudy } from '@shared/engine/study';
import { makePlan } from './plans';

describe('systems of several states', () => {
  it('runs Milstein on diagonal noise: two independent GBMs keep their closed-form means', () => {
    // dX_i = a_i X_i dt + b_i X_i dW_i; E X_i(T) = X_i(0) e^{a_i T} (closed form, K&P 1992 §4.4).
    const plan = makePlan({
      drift: ['0.1 * s0', '-0.2 * s1'],
      diffusion: [
        ['0.3 * s0', '0'],
        ['0', '0.4 * s1'],
      ],
      initial: [1, 2],
      t1: 1,
      steps: 200,
      paths: 20_000,
      method: 'milstein',
      saveCount: 2,
    });
    const result = simulate(plan);
    const expected = [Math.exp(0.1), 2 * Math.exp(-0.2)];
    const variances = [Math.exp(0.2) * (Math.exp(0.09) - 1), 4 * Math.exp(-0.4) * (Math.exp(0.16) - 1)];
    // Milstein's mean is X0(1 + ah)^N exactly (the correction term has mean zero): bias from that.
    const schemeMeans = [(1 + 0.1 / 200) ** 200, 2 * (1 - 0.2 / 200) ** 200];
    for (const i of [0, 1]) {
      const tolerance = 5 * Math.sqrt(variances[i]! / plan.paths) + Math.abs(schemeMeans[i]! - expected[i]!);
      expect(Math.abs(result.stats[i]!.mean[1]! - expected[i]!)).toBeLessThan(tolerance);
    }
  });

  it('finds Milstein strong order 1 on diagonal noise, per state', () => {
    const plan = makePlan({
      drift: ['0.5 * s0', '-0.3 * s1'],
      diffusion: [
        ['0.8 * s0', '0'],
        ['0', '0.6 * s1'],
      ],
      initial: [1, 1.5],
      t1: 1,
      steps: 64,
      paths: 1,
      method: 'milstein',
      exact: ['s0 * Math.exp((0.5 - 0.32) * t + 0.8 * w0)', 's1 * Math.exp((-0.3 - 0.18) * t + 0.6 * w1)'],
    });
    for (const state of [0, 1]) {
      // Exact GBM solution X0·exp((a − b²/2)t + bW_t) (K&P 1992 §4.4); published order 1 (K&P §10.3).
      const study = runStudy(plan, { levels: 5, coarsestSteps: 16, paths: 1500, state, reference: 'auto' });
      expect(Math.abs(study.strongOrder - 1)).toBeLessThan(0.15);
    }
  });

  it('runs stochastic Heun with two correlated noises against the Stratonovich solution', () => {
    // dX = X ∘ (0.5 dW0 + 0.3 dW1) with corr(W0, W1) = 0.6: X_t = X0·exp(0.5 W0 + 0.3 W1) (Stratonovich
    // calculus follows the ordinary chain rule, K&P 1992 §3.1). Scalar-equivalent noise, so order 1.
    const plan = makePlan({
      drift: ['0'],
      diffusion: [['0.5 * s0', '0.3 * s0']],
      correlation: [
        [1, 0.6],
        [0.6, 1],
      ],
      initial: [1],
      t1: 1,
      steps: 64,
      paths: 1,
      method: 'heun',
      calculus: 'stratonovich',
      exact: ['s0 * Math.exp(0.5 * w0 + 0.3 * w1)'],
    });
    const study = runStudy(plan, { levels: 5, coarsestSteps: 16, paths: 1500, state: 0, reference: 'auto' });
    expect(Math.abs(study.strongOrder - 1)).toBeLessThan(0.15);
    expect(study.levels.at(-1)!.strongError).toBeLessThan(0.01);
  });

  it('rejects Milstein on correlated diagonal noise and on a diffusion that reads another state', () => {
    const base = {
      drift: ['0', '0'],
      initial: [1, 1],
      t1: 1,
      steps: 10,
      paths: 5,
      method: 'milstein' as const,
    };
    expect(() =>
      simulate(
        makePlan({
          ...base,
          diffusion: [
            ['s0', '0'],
            ['0', 's1'],
          ],
          correlation: [
            [1, 0.3],
            [0.3, 1],
          ],
        }),
      ),
    ).toThrow(/independent noise sources/);
    expect(() =>
      simulate(
        makePlan({
          ...base,
          diffusion: [
            ['s1', '0'],
            ['0', 's1'],
          ],
        }),
      ),
    ).toThrow(/depend on its own state only/);
  });
});
