import { describe, expect, it } from 'vitest';
import { buildSweepChart } from '@/components/charts/sweepChart';
import type { SweepResult } from '@shared/run/sweep-result';

/** A hand-made two-parameter sweep result (not an engine output): the heat map's layout of points. */
function gridResult(): SweepResult {
  const xs = [0.1, 0.2, 0.3];
  const ys = [1, 2];
  return {
    parameters: ['h', 'sigma'],
    axisValues: [xs, ys],
    probeTitle: 'extinction probability of N',
    commonRandomNumbers: true,
    pathsPerPoint: 500,
    kernelInputs: ['h', 'sigma'],
    points: xs.flatMap((h, i) =>
      ys.map((sigma, j) => ({
        values: [h, sigma],
        estimate: i * 10 + j,
        standardError: 0.5,
        ci: [i * 10 + j - 1, i * 10 + j + 1] as [number, number],
        paths: 500,
        digest: `${i}${j}`,
        warnings: [],
        step: null,
        error: null,
      })),
    ),
    target: null,
  };
}

describe('sweep charts', () => {
  it('draws a two-parameter sweep as a heat map, rows by the second parameter, with the interval on hover', () => {
    const spec = buildSweepChart(gridResult());
    const trace = spec.traces[0] as {
      type: string;
      z: number[][];
      text: string[][];
      x: number[];
      y: number[];
    };
    expect(trace.type).toBe('heatmap');
    expect(trace.x).toEqual([0.1, 0.2, 0.3]);
    expect(trace.y).toEqual([1, 2]);
    // z[row = sigma][column = h] = 10·i + j for h index i and sigma index j.
    expect(trace.z).toEqual([
      [0, 10, 20],
      [1, 11, 21],
    ]);
    expect(trace.text[1]![2]).toContain('95 % interval [20.00, 22.00]');
    expect(spec.csv.split('\r\n')[0]).toBe('h,sigma,estimate,standardError,ciLow,ciHigh,paths,digest');
  });

  it('draws a one-parameter sweep with asymmetric 95 % error bars', () => {
    const result = gridResult();
    const one: SweepResult = {
      ...result,
      parameters: ['h'],
      axisValues: [[0.1, 0.2]],
      points: [0.1, 0.2].map((h) => ({
        ...result.points[0]!,
        values: [h],
        estimate: 0.1,
        ci: [0.08, 0.13] as [number, number],
      })),
    };
    const trace = buildSweepChart(one).traces[0] as { error_y: { array: number[]; arrayminus: number[] } };
    expect(trace.error_y.array[0]).toBeCloseTo(0.03, 12);
    expect(trace.error_y.arrayminus[0]).toBeCloseTo(0.02, 12);
  });
});
