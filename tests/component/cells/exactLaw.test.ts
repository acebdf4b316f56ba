import { describe, expect, it } from 'vitest';
import { exactLawAt, lawDensity, normalDensity } from '@/components/charts/exactLaw';
import type { ModelCell } from '@shared/sheet/document';

function oneStateModel(
  drift: string,
  diffusion: string,
  calculus: 'ito' | 'stratonovich' = 'ito',
): ModelCell {
  return {
    id: 'm',
    kind: 'model',
    states: [{ name: 'Y', initial: 'Y0', drift, diffusion: { B: diffusion } }],
    noises: [{ name: 'B' }],
    calculus,
  };
}

describe('exact laws recognised from a model', () => {
  it('gives the Ornstein–Uhlenbeck mean and variance for a mean-reverting model', () => {
    const params = { rho: 1.7, centre: -0.6, vol: 0.9 };
    const law = exactLawAt({
      model: oneStateModel('rho * (centre - Y)', 'vol'),
      params,
      x0: 2.4,
      t0: 1,
      t: 3.5,
      hasBoundary: false,
    });
    // OU closed form in mean-reversion form (Kloeden & Platen 1992, §4.4):
    // E X_t = c + (x0 − c)e^{−ρτ}, Var X_t = σ²(1 − e^{−2ρτ})/(2ρ), τ = t − t0.
    const tau = 2.5;
    expect(law).toMatchObject({ kind: 'normal' });
    if (law?.kind !== 'normal') return;
    expect(law.mean).toBeCloseTo(-0.6 + (2.4 + 0.6) * Math.exp(-1.7 * tau), 12);
    expect(law.variance).toBeCloseTo((0.81 * (1 - Math.exp(-2 * 1.7 * tau))) / (2 * 1.7), 12);
  });

  it('treats drift-free additive noise as Brownian motion (variance σ²τ)', () => {
    const law = exactLawAt({
      model: oneStateModel('0', '0.3'),
      params: {},
      x0: 1,
      t0: 0,
      t: 4,
      hasBoundary: false,
    });
    // Brownian motion: Var(σ W_t) = σ² t (closed form).
    expect(law).toEqual({ kind: 'normal', model: 'Ornstein–Uhlenbeck', mean: 1, variance: 0.09 * 4 });
  });

  it('gives the lognormal law of geometric Brownian motion, Itô and Stratonovich', () => {
    const params = { mu: 0.07, s: 0.25 };
    const ito = exactLawAt({
      model: oneStateModel('mu * Y', 's * Y'),
      params,
      x0: 50,
      t0: 0,
      t: 2,
      hasBoundary: false,
    });
    const strat = exactLawAt({
      model: oneStateModel('mu * Y', 's * Y', 'stratonovich'),
      params,
      x0: 50,
      t0: 0,
      t: 2,
      hasBoundary: false,
    });
    // GBM: log X_t ~ N(log x0 + (μ − σ²/2)t, σ²t) in Itô form; without the −σ²/2 in Stratonovich
    // form (Kloeden & Platen 1992, §4.4; Higham 2001).
    expect(ito).toMatchObject({ kind: 'lognormal' });
    if (ito?.kind !== 'lognormal' || strat?.kind !== 'lognormal') throw new Error('expected lognormal laws');
    expect(ito.logMean).toBeCloseTo(Math.log(50) + (0.07 - 0.03125) * 2, 12);
    expect(ito.logVariance).toBeCloseTo(0.0625 * 2, 12);
    expect(strat.logMean).toBeCloseTo(Math.log(50) + 0.07 * 2, 12);
  });

  it('recognises nothing for nonlinear drift, state-dependent noise of other shapes, boundaries or two states', () => {
    const base = { params: { r: 1 }, x0: 1, t0: 0, t: 1, hasBoundary: false };
    expect(exactLawAt({ ...base, model: oneStateModel('r * Y * (1 - Y)', '0.2 * Y') })).toBeNull();
    expect(exactLawAt({ ...base, model: oneStateModel('-Y', 'sqrt(abs(Y))') })).toBeNull();
    expect(exactLawAt({ ...base, model: oneStateModel('-Y', '0.2'), hasBoundary: true })).toBeNull();
    expect(exactLawAt({ ...base, model: oneStateModel('-Y + sin(t)', '0.2') })).toBeNull();
  });

  it('has densities that integrate to one', () => {
    // Riemann sums on a fine grid; the normal and lognormal densities integrate to 1 (closed form).
    const law = {
      kind: 'lognormal' as const,
      model: 'geometric Brownian motion' as const,
      logMean: 0.2,
      logVariance: 0.09,
    };
    let lognormalArea = 0;
    for (let x = 0.0005; x < 20; x += 0.001) lognormalArea += lawDensity(law, x) * 0.001;
    expect(lognormalArea).toBeCloseTo(1, 4);
    let normalArea = 0;
    for (let x = -10; x < 10; x += 0.001) normalArea += normalDensity(x, 0.5, 1.44) * 0.001;
    expect(normalArea).toBeCloseTo(1, 6);
  });
});
