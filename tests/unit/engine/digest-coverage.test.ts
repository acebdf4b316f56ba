import { describe, expect, it } from 'vitest';
import { simulateChunk } from '@shared/engine/simulate';
import { mergeChunks } from '@shared/engine/merge';
import type { ChunkResult } from '@shared/engine/result';
import { makePlan } from './plans';

/**
 * The digest is the run's fingerprint: "reproduced bit for bit" must hold for every number a run
 * reports, so changing any one of them in the last bit must change it.
 */
const plan = makePlan({
  drift: ['0.8 * (0.3 - s0)', '-0.5 * s1 + 0.2 * s0'],
  diffusion: [
    ['0.4', '0'],
    ['0', '0.3'],
  ],
  initial: [1, -0.2],
  t1: 2,
  steps: 200,
  paths: 64,
  saveCount: 5,
  probeTimes: [0.73],
  watches: [{ state: 0, level: 0.6, direction: 'below' }],
  boundaries: [{ rule: 'none' }, { rule: 'absorb', level: -0.3, side: 'below' }],
});

type Field = 'probeValues' | 'firstPassage' | 'runningMax' | 'runningMin' | 'absorptionTime' | 'saved';

function nudgedDigest(field: Field, pick: (array: Float64Array) => number): string {
  const chunk: ChunkResult = simulateChunk(plan, 0, plan.paths);
  const array = chunk[field];
  const index = pick(array);
  expect(index).toBeGreaterThanOrEqual(0);
  const value = array[index]!;
  // Next representable double: the smallest change a number can have.
  array[index] = value === 0 ? Number.MIN_VALUE : value * (1 + Number.EPSILON);
  return mergeChunks(plan, [chunk]).digest;
}

const finiteIndex = (array: Float64Array): number => array.findIndex((x) => Number.isFinite(x) && x !== 0);

describe('digest coverage', () => {
  const reference = mergeChunks(plan, [simulateChunk(plan, 0, plan.paths)]).digest;

  it.each<[Field, string]>([
    ['probeValues', 'a value at a probe time'],
    ['firstPassage', 'a first-passage time'],
    ['runningMax', 'a running maximum'],
    ['runningMin', 'a running minimum'],
    ['absorptionTime', 'an absorption time'],
  ])('changes when %s (%s) changes in its last bit', (field) => {
    expect(nudgedDigest(field, finiteIndex)).not.toBe(reference);
  });

  it('changes when a saved value that is neither a quantile nor final changes in its last bit', () => {
    // Path 5 of state 0 at saved time 1: a swap of two middle order statistics would keep the
    // quantiles, a nudge of one value may leave mean and variance bit-identical only by chance,
    // so the digest must read the values themselves.
    const d = plan.model.stateNames.length;
    expect(nudgedDigest('saved', () => (1 * d + 0) * plan.paths + 5)).not.toBe(reference);
  });
});
