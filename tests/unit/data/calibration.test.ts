import { describe, expect, it } from 'vitest';
import { bandCoverage, clopperPearson } from '@shared/data/calibration';

describe('the calibration read-out', () => {
  it('gives the Clopper–Pearson interval of a binomial share', () => {
    // 95 % exact interval for 7 of 20: [0.1539, 0.5922] (Clopper & Pearson 1934; the four-decimal
    // values are from memory of the usual tables, no page to cite).
    const [low, high] = clopperPearson(7, 20);
    expect(low).toBeCloseTo(0.1539, 4);
    expect(high).toBeCloseTo(0.5922, 4);
  });

  it('reaches 0 and 1 at the ends, where the beta quantile is undefined', () => {
    // For k = 0 the upper bound is 1 − (α/2)^{1/n} (Clopper & Pearson 1934, closed form at the edge).
    const [low, high] = clopperPearson(0, 10);
    expect(low).toBe(0);
    expect(high).toBeCloseTo(1 - 0.025 ** (1 / 10), 10);
    expect(clopperPearson(10, 10)[1]).toBe(1);
  });

  it('counts points inside the band interpolated at their own times, and leaves out points outside the run', () => {
    const band = { times: [0, 1, 2], low: [0, 1, 2], high: [2, 3, 4] };
    // At t = 0.5 the band is [0.5, 2.5]: 2.4 is inside, 2.6 is not; t = 3 lies after the run.
    const coverage = bandCoverage(band, { times: [0.5, 0.5, 1.5, 3], values: [2.4, 2.6, 2, 3] });
    expect(coverage).toMatchObject({ counted: 3, inside: 2, outsideTimeRange: 1 });
    expect(coverage.share).toBeCloseTo(2 / 3, 12);
  });
});
