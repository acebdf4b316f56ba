import fc from 'fast-check';
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

  it('gives the same quantiles through the buckets as a full sort, whatever the shape of the sample', () => {
    // quantilesInPlace narrows samples of 4,096 values or more by bucket counts first; the order
    // statistics must not depend on it (compared with sorting, the definition of type 7).
    const shapes = fc.constantFrom(
      'normal',
      'heavy tail',
      'few values',
      'one far outlier',
      'constant',
      'overflowing spread',
    );
    fc.assert(
      fc.property(
        fc.integer({ min: 4090, max: 9000 }),
        fc.integer({ min: 1, max: 2 ** 31 }),
        shapes,
        (n, seed, shape) => {
          const generator = new Xoshiro128([seed, 7, 11, n]);
          const normal = (): number => {
            const u = generator.nextOpenUnit();
            const v = generator.nextOpenUnit();
            return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
          };
          const values = Float64Array.from({ length: n }, (_, i) => {
            if (shape === 'normal') return normal();
            if (shape === 'heavy tail') return Math.exp(4 * normal());
            if (shape === 'few values') return (generator.nextUint32() % 5) - 2;
            if (shape === 'one far outlier') return i === 17 ? 1e12 : normal();
            if (shape === 'constant') return 3.25;
            return i % 2 === 0 ? -1.5e308 : 1.5e308 * generator.nextOpenUnit();
          });
          const sorted = values.slice().sort();
          const out = new Float64Array(probabilities.length);
          quantilesInPlace(values, n, probabilities, out);
          probabilities.forEach((p, i) => expect(Object.is(out[i], quantileSorted(sorted, n, p))).toBe(true));
        },
      ),
      { numRuns: 60, seed: 20261203 },
    );
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
