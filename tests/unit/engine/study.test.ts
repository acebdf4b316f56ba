import { describe, expect, it } from 'vitest';
import { runStudy } from '@shared/engine/study';
import { makePlan } from './plans';

/**
 * The experiment of Higham (2001), "An algorithmic introduction to numerical simulation of
 * stochastic differential equations", SIAM Review 43(3): dX = λX dt + μX dW with λ = 2, μ = 1,
 * X0 = 1, T = 1, exact solution X0·exp((λ − μ²/2)T + μW_T). Published orders: Euler–Maruyama
 * strong 1/2, weak 1; Milstein strong 1.
 * Tolerances: ±0.15 on strong orders and ±0.3 on the weak order, each also required to hold
 * against 3 standard errors of the fitted slope (least-squares SE from the residuals).
 */
function higham(method: 'euler-maruyama' | 'milstein') {
  return makePlan({
    drift: ['2 * s0'],
    diffusion: [['1 * s0']],
    initial: [1],
    t1: 1,
    steps: 64,
    paths: 1,
    method,
    exact: ['s0 * Math.exp((2 - 0.5) * t + 1 * w0)'],
    seed: 314159,
  });
}

const options = { levels: 5, coarsestSteps: 16, paths: 2000, state: 0, reference: 'auto' as const };

describe('step-size study on the Higham (2001) experiment', () => {
  it('finds Euler–Maruyama strong order 1/2 and weak order 1', () => {
    const study = runStudy(higham('euler-maruyama'), options);
    expect(study.reference).toBe('exact');
    expect(study.levels.map((level) => level.steps)).toEqual([16, 32, 64, 128, 256]);
    // The fit is tight enough for ±0.15 to mean something: 3 SE of the slope lie inside it.
    expect(3 * study.strongOrderSE).toBeLessThan(0.15);
    expect(Math.abs(study.strongOrder - 0.5)).toBeLessThan(0.15);
    expect(Math.abs(study.weakOrder - 1)).toBeLessThan(0.3);
    expect(study.strongOrderCI[0]).toBeLessThan(study.strongOrder);
    expect(study.strongOrderCI[1]).toBeGreaterThan(study.strongOrder);
    // Errors shrink as h does.
    for (let i = 1; i < study.levels.length; i++)
      expect(study.levels[i]!.strongError).toBeLessThan(study.levels[i - 1]!.strongError);
  });

  it('finds Milstein strong order 1', () => {
    const study = runStudy(higham('milstein'), options);
    expect(Math.abs(study.strongOrder - 1)).toBeLessThan(0.15);
  });

  it('measures against the finest level when there is no exact solution and leaves it out of the fit', () => {
    const plan = { ...higham('euler-maruyama'), model: { ...higham('euler-maruyama').model, exact: [null] } };
    const study = runStudy(plan, options);
    expect(study.reference).toBe('finest');
    expect(study.levels).toHaveLength(4);
    // Against a reference at h/16 the fitted strong order is still near 1/2 (wider tolerance: the
    // reference's own error shrinks the coarse-level differences less than the fine ones).
    expect(Math.abs(study.strongOrder - 0.5)).toBeLessThan(0.2);
  });

  it('rejects an exact reference when the model has none', () => {
    const plan = { ...higham('euler-maruyama'), model: { ...higham('euler-maruyama').model, exact: [null] } };
    expect(() => runStudy(plan, { ...options, reference: 'exact' })).toThrow(/has none/);
  });
});

describe('stochastic Heun on a Stratonovich model', () => {
  it('converges to the Stratonovich solution X0·exp(aW) with strong order 1', () => {
    // dX = a X ∘ dW has the Stratonovich solution X0·exp(a W_t) (Kloeden & Platen 1992, §4.9);
    // the Itô reading would give X0·exp(a W_t − a²t/2) instead. a = 0.6, X0 = 2 (our values).
    const plan = makePlan({
      drift: ['0'],
      diffusion: [['0.6 * s0']],
      initial: [2],
      t1: 1,
      steps: 64,
      paths: 1,
      method: 'heun',
      calculus: 'stratonovich',
      exact: ['s0 * Math.exp(0.6 * w0)'],
    });
    const study = runStudy(plan, options);
    // Scalar noise: Heun has strong order 1 (Kloeden & Platen 1992, §11.1; Rümelin 1982).
    expect(Math.abs(study.strongOrder - 1)).toBeLessThan(0.15);
    const finest = study.levels.at(-1)!;
    // At h = 1/256 the mean error is far below the Itô/Stratonovich gap E|X0 e^{aW}(1 − e^{−a²/2})| ≈ 2·0.165.
    expect(finest.strongError).toBeLessThan(0.01);
  });
});
