import { describe, expect, it } from 'vitest';
import { formatEstimate, formatSignificant } from '@/components/cells/numberFormat';
import { estimateRunCost, formatBytes, stepCount } from '@/components/cells/simulationCost';
import { parseIntegerText, parseNumberText } from '@/components/cells/numberText';
import type { SimulationCell } from '@shared/sheet/document';

describe('number formatting', () => {
  it('rounds an estimate to the second significant digit of its standard error', () => {
    // Rounding rule: two significant digits of the error (common practice, no single source).
    expect(formatEstimate(0.123456, 0.0056789, [0.11232, 0.13459])).toEqual({
      estimate: '0.1235',
      standardError: '0.0057',
      low: '0.1123',
      high: '0.1346',
    });
    expect(formatEstimate(1234.567, 12.3, [1210.5, 1258.6])).toMatchObject({
      estimate: '1235',
      standardError: '12',
    });
  });

  it('gives an interval three digits when the paths show no spread', () => {
    // A probability seen on no path: the estimate is exactly 0, the interval is not.
    expect(formatEstimate(0, 0, [0, 0.00477888])).toEqual({
      estimate: '0',
      standardError: '0',
      low: '0',
      high: '0.00478',
    });
  });

  it('writes negative numbers with a minus sign and never "−0"', () => {
    expect(formatEstimate(-0.00001, 0.01, [-0.02, 0.02]).estimate).toBe('0.000');
    expect(formatSignificant(-2.5)).toBe('−2.5');
  });

  it('uses powers of ten for very large or small values', () => {
    expect(formatSignificant(1.5e-7, 3)).toBe('1.5 × 10^-7');
    expect(formatSignificant(Number.NaN)).toBe('—');
  });
});

describe('number fields', () => {
  it('parses plain and exponent notation and rejects the rest with a message', () => {
    expect(parseNumberText(' -1.5e-3 ')).toEqual({ ok: true, value: -0.0015 });
    expect(parseNumberText('abc')).toMatchObject({ ok: false });
    expect(parseNumberText('0x10')).toMatchObject({ ok: false });
    expect(parseIntegerText('2.5', 'paths', { min: 1, max: 10 })).toMatchObject({
      ok: false,
      message: /whole number/,
    });
    expect(parseIntegerText('11', 'paths', { min: 1, max: 10 })).toMatchObject({
      ok: false,
      message: /between 1 and 10/,
    });
  });
});

describe('run cost estimate', () => {
  const cell: SimulationCell = {
    id: 's',
    kind: 'simulation',
    model: 'm',
    method: 'euler-maruyama',
    t0: 0,
    t1: 10,
    steps: 1000,
    paths: 100_000,
    seed: 1,
    saveCount: 101,
    samplePaths: 20,
    boundaries: {},
    overrides: {},
  };

  it('counts path-steps, seconds at 40 M path-steps/s per worker, and saved-value memory', () => {
    const cost = estimateRunCost(cell, 2, 5)!;
    expect(cost.pathSteps).toBe(1e8);
    expect(cost.workers).toBe(4);
    // The engine's nominal rate counts state-steps: two states, four workers.
    expect(cost.seconds).toBeCloseTo((1e8 * 2) / (40e6 * 4), 12);
    expect(cost.bytes).toBe(100_000 * 101 * 2 * 8);
    expect(cost.warning).toBeNull();
  });

  it('warns above about 1 GB of saved values', () => {
    const cost = estimateRunCost({ ...cell, paths: 1_000_000, saveCount: 201 }, 1, 1)!;
    expect(cost.workers).toBe(1);
    expect(cost.bytes).toBe(1_608_000_000);
    expect(cost.warning).toMatch(/1\.61 GB/);
  });

  it('derives the steps from a step size as the plan does (nearest whole step)', () => {
    expect(stepCount({ t0: 0, t1: 1, stepSize: 0.3 })).toBe(3);
    expect(stepCount({ t0: 0, t1: 1, stepSize: 0.25 })).toBe(4);
    expect(formatBytes(2_500_000)).toBe('2.50 MB');
  });
});
