import { describe, expect, it } from 'vitest';
import { compareRerun, type SimulationRecord } from '@shared/run/compare';

const record = (
  digest: string,
  engineVersion: number,
  final?: SimulationRecord['final'],
): SimulationRecord => ({
  digest,
  engineVersion,
  ...(final ? { paths: 10_000, final } : {}),
});

describe('compareRerun', () => {
  it('says a simulation reproduced bit for bit when the engine and digest are the same', () => {
    const result = compareRerun({ sim: record('a1b2', 2) }, { sim: record('a1b2', 2) }, 2);
    expect(result.checks).toEqual([
      { cellId: 'sim', outcome: 'reproduced', message: 'reproduced bit for bit', worstSE: null },
    ]);
    expect(result.allGood).toBe(true);
    expect(result.engineChanged).toBe(false);
  });

  it('says it differs when the engine is the same and the digest is not', () => {
    const result = compareRerun({ sim: record('a1b2', 2) }, { sim: record('ffff', 2) }, 2);
    expect(result.checks[0]?.outcome).toBe('differs');
    expect(result.checks[0]?.message).toContain('ffff');
    expect(result.allGood).toBe(false);
  });

  it('reports a saved simulation missing from the rerun instead of passing it', () => {
    const result = compareRerun({ sim: record('a1b2', 2) }, {}, 2);
    expect(result.checks[0]?.outcome).toBe('not-rerun');
    expect(result.allGood).toBe(false);
  });

  it('compares means and variances within standard errors under another engine version', () => {
    // Mean: SE of a sample mean is √(s²/n) (any statistics text); two independent means differ
    // with SE √(0.04/10⁴ + 0.04/10⁴) = 0.002828, so 0.0042 apart is 1.485 SE.
    const saved = { sim: record('old', 1, { X: { mean: 1, variance: 0.04 } }) };
    const rerun = { sim: record('new', 2, { X: { mean: 1.0042, variance: 0.04 } }) };
    const result = compareRerun(saved, rerun, 2);
    expect(result.engineChanged).toBe(true);
    expect(result.checks[0]?.outcome).toBe('agrees');
    expect(result.checks[0]?.worstSE).toBeCloseTo(0.0042 / Math.sqrt(0.08 / 10_000), 9);
    expect(result.checks[0]?.message).toBe('agrees within 1.5 SE');
    expect(result.allGood).toBe(true);
  });

  it('flags a variance far outside its standard error under another engine version', () => {
    // Sample variance of normal data has SE s²·√(2/(n−1)) (from memory): 0.000566 for 0.04 and
    // 0.000651 for 0.046, 0.000862 together; 0.006 apart is 6.96 SE, beyond the 4 SE that agree.
    const saved = { sim: record('old', 1, { X: { mean: 1, variance: 0.04 } }) };
    const rerun = { sim: record('new', 2, { X: { mean: 1, variance: 0.046 } }) };
    const check = compareRerun(saved, rerun, 2).checks[0]!;
    const se = Math.hypot(0.04, 0.046) * Math.sqrt(2 / 9_999);
    expect(check.outcome).toBe('disagrees');
    expect(check.worstSE).toBeCloseTo(0.006 / se, 9);
    expect(check.message).toBe('disagrees: 7.0 SE apart (more than 4)');
  });

  it('cannot compare across engine versions without saved statistics, and says so', () => {
    const result = compareRerun(
      { sim: record('old', 1) },
      { sim: record('new', 2, { X: { mean: 1, variance: 1 } }) },
      2,
    );
    expect(result.checks[0]?.outcome).toBe('not-comparable');
    expect(result.allGood).toBe(false);
  });
});
