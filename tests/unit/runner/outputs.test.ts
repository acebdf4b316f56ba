import { describe, expect, it } from 'vitest';
import { cellOutputJson, type StudyJson } from '@shared/run/output-json';
import type { StudyResult } from '@shared/engine/result';

describe('runner outputs', () => {
  it('passes the fitted orders’ standard errors and 95 % intervals through to the study output', () => {
    const result: StudyResult = {
      levels: [],
      strongOrder: 0.52,
      strongOrderSE: 0.03,
      strongOrderCI: [0.4, 0.64],
      weakOrder: 1.1,
      weakOrderSE: Number.NaN,
      weakOrderCI: [Number.NaN, Number.NaN],
      reference: 'exact',
      paths: 100,
      excluded: 0,
    };
    const output = cellOutputJson('s', 'study', {
      kind: 'study',
      plan: {} as never,
      result,
      finishedAt: new Date(),
      seconds: 0,
    }) as StudyJson;
    expect(output.strongOrderSE).toBe(0.03);
    expect(output.strongOrderCI).toEqual([0.4, 0.64]);
    // JSON has no NaN: an interval that cannot be fitted is null at both ends.
    expect(output.weakOrderSE).toBeNull();
    expect(output.weakOrderCI).toEqual([null, null]);
  });
});
