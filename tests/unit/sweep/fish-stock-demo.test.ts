import { describe, expect, it } from 'vitest';
import { findExampleSheet } from '@shared/examples/index';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheetToJson } from '@shared/run/run-sheet';
import { scaleSheetPaths } from '@shared/run/scale';
import type { ScenariosJson } from '@shared/run/scenarios-result';
import type { SweepJson } from '@shared/run/sweep-result';

/** The harvested fish stock demo's sweep and plans, through the runner's JSON, at a quarter of the paths. */
describe('fish-stock demo: harvest sweep and management plans', () => {
  it('brackets 5 % collapse risk, reports the harvest rate with its interval, and compares three plans', async () => {
    const doc = scaleSheetPaths(findExampleSheet('harvested-fish-stock')!.document, 0.25);
    const only = { ...doc, cells: doc.cells.filter((cell) => cell.kind !== 'study') };
    const output = await runSheetToJson(only, inProcessExecutor());
    const sweep = output.cells.find((cell) => cell.id === 'harvest-sweep') as SweepJson;
    expect(sweep.table).toHaveLength(7);
    expect(sweep.table.map((row) => row.h)).toEqual([0, 0.05, 0.1, 0.15, 0.2, 0.25, 0.3]);
    // Collapse risk grows with harvest (paired neighbours; a larger harvest can only hurt here).
    const risks = sweep.table.map((row) => row.estimate as number);
    expect(risks[6]!).toBeGreaterThan(risks[0]!);
    expect(sweep.target!.bracketed).toBe(true);
    const [lo, hi] = sweep.target!.interval!;
    expect(lo).toBeLessThanOrEqual(sweep.target!.root!);
    expect(hi).toBeGreaterThanOrEqual(sweep.target!.root!);
    expect(sweep.target!.message).toMatch(/^target 0\.05 met at/);

    const plans = output.cells.find((cell) => cell.id === 'management-plans') as ScenariosJson;
    expect(plans.baseline).toBe('present rate');
    const cautious = plans.table.find(
      (row) => row.scenario === 'cautious quota' && row.probe === 'extinction probability of N',
    )!;
    // Fishing less lowers the collapse risk by more than noise: the difference's interval is below 0.
    expect(cautious.differenceCiHigh as number).toBeLessThan(0);
    expect(cautious.differencePairedSE as number).toBeLessThan(cautious.differenceIndependentSE as number);
  });
});
