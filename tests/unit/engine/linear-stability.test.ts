import { describe, expect, it } from 'vitest';
import { eigenvalues } from '@shared/engine/eigenvalues';
import { simulate } from '@shared/engine/simulate';
import { stabilityReport } from '@shared/engine/stability';
import { makePlan } from './plans';

function sortedPairs(result: { re: Float64Array; im: Float64Array }): [number, number][] {
  return Array.from(result.re, (re, i): [number, number] => [re, result.im[i]!]).sort(
    (a, b) => a[0] - b[0] || a[1] - b[1],
  );
}

describe('eigenvalues of a small real matrix', () => {
  it('finds a complex pair, real eigenvalues, and those of a similarity transform', () => {
    // A rotation generator has eigenvalues ±i (any linear algebra text).
    const rotation = sortedPairs(eigenvalues(Float64Array.of(0, -1, 1, 0), 2));
    expect(rotation[0]![0]).toBeCloseTo(0, 12);
    expect(Math.abs(rotation[0]![1])).toBeCloseTo(1, 12);
    // A triangular matrix has its diagonal as eigenvalues; S T S⁻¹ keeps them (S lower
    // triangular with ones, whose inverse has 1 on the diagonal and −1 just below it).
    const n = 4;
    const t = [
      [-3, 1, 2, 0.5],
      [0, -0.5, 4, 1],
      [0, 0, 2, -1],
      [0, 0, 0, -7],
    ];
    const s = (i: number, j: number) => (i === j ? 1 : i > j ? 1 : 0);
    const sInverse = (i: number, j: number) => (i === j ? 1 : i === j + 1 ? -1 : 0);
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        let sum = 0;
        for (let k = 0; k < n; k++) for (let l = 0; l < n; l++) sum += s(i, k) * t[k]![l]! * sInverse(l, j);
        a[i * n + j] = sum;
      }
    const found = sortedPairs(eigenvalues(a, n));
    [-7, -3, -0.5, 2].forEach((expected, i) => {
      expect(found[i]![0]).toBeCloseTo(expected, 9);
      expect(found[i]![1]).toBeCloseTo(0, 9);
    });
  });
});

describe('stability of the step for a linear drift', () => {
  // dX = A X dt + B dW with A of eigenvalues −1 and −100: Euler–Maruyama multiplies the mean by
  // I + hA per step, unstable when |1 + hλ| > 1 for an eigenvalue λ (Higham 2000, §2, the
  // deterministic part of the mean-square condition; for additive noise it is the whole of it).
  const stiff = (steps: number) =>
    makePlan({
      drift: ['-1 * s0 + 0.5 * s1', '-100 * s1'],
      diffusion: [
        ['0.2', '0'],
        ['0', '0.2'],
      ],
      initial: [1, 1],
      t1: 10,
      steps,
      paths: 200,
      saveCount: 11,
    });

  it('says a stiff linear model at hλ = −10 is unstable, before its huge numbers are read', () => {
    const report = stabilityReport(stiff(100));
    expect(report).not.toBeNull();
    expect(report!.stable).toBe(false);
    expect(report!.modelStable).toBe(true);
    expect(report!.lambda).toBeCloseTo(-100, 6);
    expect(report!.amplification).toBeCloseTo(9, 6); // |1 + hλ| = |1 − 10|
    expect(report!.message).toMatch(/hλ = −10/);
    expect(report!.maxStableStep).toBeCloseTo(0.02, 6); // |1 + hλ| ≤ 1 ⇔ h ≤ 2/100
    expect(report!.message).toMatch(/Try a smaller step/);
    expect(simulate(stiff(100)).stability?.stable).toBe(false);
  });

  it('finds the same step stable once h < 2/|λ|', () => {
    const report = stabilityReport(stiff(1000));
    expect(report!.stable).toBe(true);
    expect(report!.amplification).toBeLessThan(1);
  });

  it('checks a scalar model with additive noise (mean square: |1 + hλ| < 1)', () => {
    const additive = makePlan({
      drift: ['-50 * s0'],
      diffusion: [['0.3']],
      initial: [1],
      t1: 1,
      steps: 10,
      paths: 10,
    });
    const report = stabilityReport(additive);
    expect(report!.stable).toBe(false);
    expect(report!.lambda).toBeCloseTo(-50, 6);
  });

  it('follows a nonlinear drift along the run, at the mean state of each saved time', () => {
    // dX = (8 − X³) dt: the Jacobian −3X² is −0.03 at X0 = 0.1 but −12 at the equilibrium X = 2,
    // where h = 0.2 gives |1 + hλ| = 1.4 > 1 (Euler's linear stability; Hairer & Wanner 1996, §IV.2).
    const plan = makePlan({
      drift: ['8 - s0 * s0 * s0'],
      diffusion: [['0']],
      initial: [0.1],
      t1: 2,
      steps: 10,
      paths: 2,
    });
    expect(stabilityReport(plan)!.stable).toBe(true);
    const result = simulate(plan);
    expect(result.stability!.stable).toBe(false);
    expect(result.stability!.time).toBeGreaterThan(0);
  });
});
