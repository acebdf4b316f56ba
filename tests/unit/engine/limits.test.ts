import { describe, expect, it } from 'vitest';
import { planLayout } from '@shared/engine/layout';
import { estimateWork } from '@shared/engine/work';
import { MAX_PATHS, MAX_STEPS } from '@shared/engine/limits';
import { makePlan } from './plans';

const base = makePlan({ drift: ['-s0'], diffusion: [['1']], initial: [0], t1: 1, steps: 10, paths: 2 });

describe('limits on the resolved step and path counts', () => {
  it('rejects a plan whose step count is beyond the cap, however it was reached', () => {
    // 2^31 steps used to wrap a 32-bit bound in the kernel and never end.
    expect(() => planLayout({ ...base, steps: 2 ** 31 })).toThrow(RangeError);
    expect(() => planLayout({ ...base, steps: MAX_STEPS + 1 })).toThrow(/at most 10,000,000 steps/);
    expect(() => planLayout({ ...base, steps: MAX_STEPS })).not.toThrow();
  });

  it('rejects a plan whose path count is beyond the cap', () => {
    expect(() => planLayout({ ...base, saveCount: 2, paths: MAX_PATHS + 1 })).toThrow(
      /at most 10,000,000 paths/,
    );
  });

  it('keeps every saved step index exact up to the step cap', () => {
    const layout = planLayout({ ...base, steps: MAX_STEPS, saveCount: 7 });
    expect(Array.from(layout.saveSteps.subarray(0, 7))).toEqual(
      [0, 1, 2, 3, 4, 5, 6].map((k) => Math.round((k * MAX_STEPS) / 6)),
    );
  });
});

describe('work estimate', () => {
  it('counts path-steps and says when a run is far beyond a few minutes of work', () => {
    const small = estimateWork({ ...base, paths: 1000, steps: 1000 });
    expect(small.pathSteps).toBe(1e6);
    expect(small.beyondMinutes).toBe(false);
    expect(small.message).toBeNull();
    const huge = estimateWork({ ...base, paths: MAX_PATHS, steps: MAX_STEPS });
    expect(huge.pathSteps).toBe(1e14);
    expect(huge.beyondMinutes).toBe(true);
    expect(huge.seconds).toBeGreaterThan(3600);
    expect(huge.message).toMatch(/1\.00e\+14 path-steps/);
  });
});
