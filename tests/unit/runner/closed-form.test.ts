import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { findExampleSheet } from '@shared/examples/index';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheetToJson } from '@shared/run/run-sheet';
import { scaleSheetPaths } from '@shared/run/scale';
import type { CellOutputJson } from '@shared/run/output-json';

/**
 * The example sheets' probes against closed forms, run through the whole runner (plan, chunks,
 * merge, probe). Path counts are scaled down; tolerances are 4.5 standard errors of a proportion
 * at the exact value, plus the stated discretisation allowance.
 */
function probe(cells: CellOutputJson[], id: string) {
  const cell = cells.find((c) => c.id === id);
  if (!cell || cell.kind !== 'probe' || 'error' in cell)
    throw new Error(`no probe output ${id}: ${JSON.stringify(cell)}`);
  return cell;
}

describe('example probes against closed forms', () => {
  it('soil moisture: P(A_60 ≤ −25 mm) matches the Ornstein–Uhlenbeck normal law', async () => {
    const doc = scaleSheetPaths(findExampleSheet('soil-moisture-anomaly')!.document, 0.25); // 5000 paths
    const output = await runSheetToJson(doc, inProcessExecutor());
    const odds = probe(output.cells, 'drought-odds');
    const tau = 24,
      s = 9,
      a0 = 15,
      t = 60,
      threshold = -25,
      h = 60 / 1200;
    // OU law: mean a0·e^{−t/τ}, variance (s²τ/2)(1 − e^{−2t/τ}) (Kloeden & Platen 1992, §4.4).
    const mean = a0 * Math.exp(-t / tau);
    const sd = Math.sqrt(((s * s * tau) / 2) * (1 - Math.exp((-2 * t) / tau)));
    const exact = jStat.normal.cdf(threshold, mean, sd);
    // The Euler–Maruyama recursion A ← (1 − h/τ)A + s√h Z is itself exactly normal: mean a0·ρⁿ and
    // variance s²h(1 − ρ²ⁿ)/(1 − ρ²) with ρ = 1 − h/τ (geometric sum; scheme as in Higham 2001).
    const rho = 1 - h / tau,
      n = t / h;
    const emExact = jStat.normal.cdf(
      threshold,
      a0 * rho ** n,
      Math.sqrt((s * s * h * (1 - rho ** (2 * n))) / (1 - rho * rho)),
    );
    const se = Math.sqrt((emExact * (1 - emExact)) / 5000);
    expect(odds.paths).toBe(5000);
    expect(Math.abs(odds.estimate! - emExact)).toBeLessThan(4.5 * se);
    expect(Math.abs(emExact - exact)).toBeLessThan(0.002);
    expect(odds.ci[0]!).toBeLessThan(odds.estimate!);
    expect(odds.ci[1]!).toBeGreaterThan(odds.estimate!);
  });

  it('price index: P(S_2 ≥ 130) matches the lognormal law of geometric Brownian motion', async () => {
    const doc = scaleSheetPaths(findExampleSheet('commodity-price-index')!.document, 0.2); // 10 000 paths
    const output = await runSheetToJson(doc, inProcessExecutor());
    const rise = probe(output.cells, 'rise-odds');
    const mu = 0.035,
      sigma = 0.27,
      s0 = 100,
      T = 2,
      level = 130;
    // ln S_T ~ N(ln S0 + (μ − σ²/2)T, σ²T) (Kloeden & Platen 1992, ch. 4; Higham 2001).
    const exact =
      1 -
      jStat.normal.cdf(Math.log(level), Math.log(s0) + (mu - (sigma * sigma) / 2) * T, sigma * Math.sqrt(T));
    const se = Math.sqrt((exact * (1 - exact)) / 10_000);
    // Allowance 0.003 for Milstein's O(h) weak bias at h = 0.004 (common practice, no source).
    expect(rise.paths).toBe(10_000);
    expect(Math.abs(rise.estimate! - exact)).toBeLessThan(4.5 * se + 0.003);
  });

  it('price index: the study against the exact solution sees Milstein converge at strong order about 1', async () => {
    const doc = scaleSheetPaths(findExampleSheet('commodity-price-index')!.document, 0.5); // study: 2000 samples
    const output = await runSheetToJson(doc, inProcessExecutor());
    const study = output.cells.find((c) => c.id === 'step-check');
    if (!study || study.kind !== 'study' || 'error' in study) throw new Error(JSON.stringify(study));
    expect(study.reference).toBe('exact');
    // Milstein has strong order 1 (Kloeden & Platen 1992, §10.3; Higham 2001); ±0.25 allows for the fit's
    // sampling error over 2000 paths and six levels (common practice, no source).
    expect(study.strongOrder!).toBeGreaterThan(0.75);
    expect(study.strongOrder!).toBeLessThan(1.25);
    for (let i = 1; i < study.levels.length; i++)
      expect(study.levels[i]!.strongError!).toBeLessThan(study.levels[i - 1]!.strongError!);
  });
});
