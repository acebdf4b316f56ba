import { describe, expect, it } from 'vitest';
import { moments, quantileSorted, quantilesInPlace, selectInPlace } from '@shared/engine/statistics';
import { Xoshiro128 } from '@shared/engine/random/xoshiro128';

const probabilities = [0, 0.05, 0.25, 0.5, 0.75, 0.95, 1];

function sample(n: number, ties: boolean): Float64Array {
  const generator = new Xoshiro128([1, 2, 3, n]);
  return Float64Array.from({ length: n }, () =>
    ties ? generator.nextUint32() % 7 : generator.nextOpenUnit() - 0.3,
  );
}

describe('order statistics', () => {
  it('selects the k-th smallest value like a full sort does', () => {
    for (const n of [1, 2, 3, 10, 101, 1000]) {
      const values = sample(n, n % 2 === 0);
      const sorted = values.slice().sort();
      for (const k of [0, n >> 1, n - 1]) {
        const copy = values.slice();
        selectInPlace(copy, 0, n - 1, k);
        expect(copy[k]).toBe(sorted[k]);
      }
    }
  });

  it('gives type-7 quantiles identical to interpolating the sorted sample (Hyndman & Fan 1996)', () => {
    for (const [n, ties] of [
      [1, false],
      [2, false],
      [5, true],
      [999, false],
      [1000, true],
      [10_000, false],
    ] as const) {
      const values = sample(n, ties);
      const sorted = values.slice().sort();
      const out = new Float64Array(probabilities.length);
      quantilesInPlace(values, n, probabilities, out);
      probabilities.forEach((p, i) => expect(out[i]).toBe(quantileSorted(sorted, n, p)));
    }
  });

  it('computes type 7 on a small hand example', () => {
    // 1..10, p = 0.05: h = 9·0.05 = 0.45 → 1 + 0.45·(2 − 1) = 1.45 (Hyndman & Fan 1996, type 7).
    const out = new Float64Array(1);
    quantilesInPlace(Float64Array.from([10, 9, 8, 7, 6, 5, 4, 3, 2, 1]), 10, [0.05], out);
    expect(out[0]).toBeCloseTo(1.45, 14);
  });

  it('ignores non-finite values in the moments', () => {
    const m = moments([1, 2, NaN, 3, Infinity]);
    expect(m.count).toBe(3);
    expect(m.mean).toBe(2);
    expect(m.variance).toBe(1);
  });
});
