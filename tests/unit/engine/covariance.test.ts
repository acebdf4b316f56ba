import { describe, expect, it } from 'vitest';
import { simulate } from '@shared/engine/simulate';
import { evaluateProbe, Z95 } from '@shared/engine/probes';
import { makePlan } from './plans';

/**
 * dX = A X dt + B dW in two dimensions: the covariance Σ(t) solves dΣ/dt = AΣ + ΣAᵀ + BBᵀ
 * (Gardiner, Handbook of Stochastic Methods, §4.4.6), so at stationarity the Lyapunov equation
 * AΣ + ΣAᵀ + BBᵀ = 0. Euler–Maruyama's own stationary covariance solves instead
 * Σ = (I + hA)Σ(I + hA)ᵀ + h BBᵀ (Kloeden & Platen 1992, §9.1 applied to the second moments);
 * the difference is the scheme's O(h) bias, allowed for in the tolerance. Values our own.
 */
const a = [
  [-1.2, 0.4],
  [0.3, -0.8],
];
const b = [
  [0.5, 0],
  [0.2, 0.35],
];

/** Solves M Σ + Σ Mᵀ + Q = 0 (or, with `h`, Σ = (I + hM)Σ(I + hM)ᵀ + hQ) for symmetric 2 × 2 Σ. */
function stationaryCovariance(m: number[][], q: number[][], h?: number): [number, number, number] {
  // Unknowns (s11, s12, s22); build the 3 × 3 linear system by applying the map to unit vectors.
  const apply = (s11: number, s12: number, s22: number): [number, number, number] => {
    const s = [
      [s11, s12],
      [s12, s22],
    ];
    const out = [
      [0, 0],
      [0, 0],
    ];
    for (let i = 0; i < 2; i++)
      for (let j = 0; j < 2; j++) {
        let value = 0;
        for (let k = 0; k < 2; k++) value += m[i]![k]! * s[k]![j]! + s[i]![k]! * m[j]![k]!;
        if (h !== undefined) {
          for (let k = 0; k < 2; k++)
            for (let l = 0; l < 2; l++) value += h * m[i]![k]! * s[k]![l]! * m[j]![l]!;
        }
        out[i]![j] = value;
      }
    return [out[0]![0]!, out[0]![1]!, out[1]![1]!];
  };
  const columns = [apply(1, 0, 0), apply(0, 1, 0), apply(0, 0, 1)];
  const rhs = [-q[0]![0]!, -q[0]![1]!, -q[1]![1]!];
  // Cramer's rule on the 3 × 3 system.
  const det = (c: number[][]) =>
    c[0]![0]! * (c[1]![1]! * c[2]![2]! - c[2]![1]! * c[1]![2]!) -
    c[1]![0]! * (c[0]![1]! * c[2]![2]! - c[2]![1]! * c[0]![2]!) +
    c[2]![0]! * (c[0]![1]! * c[1]![2]! - c[1]![1]! * c[0]![2]!);
  const d = det(columns);
  const solve = (k: number) => det(columns.map((col, j) => (j === k ? rhs : col))) / d;
  return [solve(0), solve(1), solve(2)];
}

const q = [
  [b[0]![0]! ** 2 + b[0]![1]! ** 2, b[0]![0]! * b[1]![0]! + b[0]![1]! * b[1]![1]!],
  [b[0]![0]! * b[1]![0]! + b[0]![1]! * b[1]![1]!, b[1]![0]! ** 2 + b[1]![1]! ** 2],
];
const h = 0.01;
const plan = makePlan({
  drift: [`${a[0]![0]} * s0 + ${a[0]![1]} * s1`, `${a[1]![0]} * s0 + ${a[1]![1]} * s1`],
  diffusion: [
    [`${b[0]![0]}`, `${b[0]![1]}`],
    [`${b[1]![0]}`, `${b[1]![1]}`],
  ],
  initial: [0, 0],
  t1: 12,
  steps: 1200,
  paths: 20_000,
  saveCount: 5,
});

describe('covariance between states', () => {
  const result = simulate(plan);
  const exact = stationaryCovariance(a, q);
  const scheme = stationaryCovariance(a, q, h);

  it('keeps the covariance matrix at each saved time, matching the Lyapunov equation at stationarity', () => {
    const last = plan.saveCount - 1;
    const cov = result.covariance!;
    expect(cov).not.toBeNull();
    const at = (i: number, j: number) => cov[(last * 2 + i) * 2 + j]!;
    expect(at(0, 1)).toBe(at(1, 0));
    expect(at(0, 0)).toBe(result.stats[0]!.variance[last]);
    const estimate = evaluateProbe(result, { quantity: 'covariance', state: 0, stateY: 1 });
    expect(estimate.estimate).toBeCloseTo(at(0, 1), 12);
    // Tolerance: 5 standard errors of the estimate plus the scheme's known bias |Σ_h − Σ|.
    const bias = Math.abs(scheme[1] - exact[1]);
    expect(Math.abs(estimate.estimate - exact[1])).toBeLessThan(5 * estimate.standardError + bias);
    expect(estimate.ci[0]).toBeCloseTo(estimate.estimate - Z95 * estimate.standardError, 12);
  });

  it('estimates the correlation with a Fisher-transform interval', () => {
    const estimate = evaluateProbe(result, { quantity: 'correlation', state: 0, stateY: 1 });
    const exactCorrelation = exact[1] / Math.sqrt(exact[0] * exact[2]);
    const schemeCorrelation = scheme[1] / Math.sqrt(scheme[0] * scheme[2]);
    const bias = Math.abs(schemeCorrelation - exactCorrelation);
    expect(Math.abs(estimate.estimate - exactCorrelation)).toBeLessThan(5 * estimate.standardError + bias);
    // Fisher (1921): atanh(r) ± z/√(n − 3), mapped back with tanh.
    const z = Math.atanh(estimate.estimate);
    const half = Z95 / Math.sqrt(estimate.paths - 3);
    expect(estimate.ci[0]).toBeCloseTo(Math.tanh(z - half), 12);
    expect(estimate.ci[1]).toBeCloseTo(Math.tanh(z + half), 12);
    expect(estimate.note).toMatch(/Fisher/);
  });

  it('wants a second, different state', () => {
    expect(() => evaluateProbe(result, { quantity: 'covariance', state: 0 })).toThrow(/second state/);
  });

  it('keeps no covariance matrix for a model with one state', () => {
    const scalar = makePlan({
      drift: ['-s0'],
      diffusion: [['1']],
      initial: [0],
      t1: 1,
      steps: 10,
      paths: 10,
    });
    expect(simulate(scalar).covariance).toBeNull();
  });
});
