import { describe, expect, it } from 'vitest';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet } from '@shared/run/run-sheet';
import type { ScenariosResult } from '@shared/run/scenarios-result';
import { sheet } from './sheets';

/** A mean-reverting level with two close scenarios (θ = 1 and θ = 1.05): a small difference. */
function pairSheet(seed: number, independent: boolean) {
  return sheet({
    params: { theta: 1, sigma: 0.5 },
    drift: '-theta * X',
    diffusion: 'sigma',
    initial: '1',
    t1: 1,
    steps: 20,
    paths: 1000,
    seed,
    probes: [{ id: 'level', quantity: 'mean' }],
    cells: [
      {
        id: 'sc',
        kind: 'scenarios',
        simulation: 'sim',
        probes: ['level'],
        scenarios: [
          { name: 'slow', overrides: {} },
          { name: 'faster', overrides: { theta: 1.05 } },
        ],
        baseline: 'slow',
        independent,
      },
    ],
  });
}

async function difference(seed: number, independent: boolean) {
  const run = await runSheet(pairSheet(seed, independent), { executor: inProcessExecutor(), target: 'sc' });
  const output = run.outputs.get('sc')!.output;
  if (output.kind !== 'scenarios') throw new Error(JSON.stringify(output));
  const result: ScenariosResult = output.result;
  return result.scenarios[1]!.probes[0]!.difference!;
}

function sd(values: number[]): number {
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1));
}

describe('common random numbers', () => {
  it('pairs a small difference: its standard error is at least 5× smaller than independent runs give', async () => {
    const paired = await difference(11, false);
    expect(paired.pairedSE).not.toBeNull();
    expect(paired.independentSE / paired.pairedSE!).toBeGreaterThan(5);
    const independent = await difference(11, true);
    expect(independent.pairedSE).toBeNull();
  });

  it('reports both standard errors in agreement with the spread over 30 seeds', async () => {
    const seeds = Array.from({ length: 30 }, (_, k) => 1000 + 17 * k);
    const paired = [];
    const independent = [];
    for (const seed of seeds) {
      paired.push(await difference(seed, false));
      independent.push(await difference(seed, true));
    }
    const meanOf = (values: number[]) => values.reduce((a, b) => a + b, 0) / values.length;
    const pairedSpread = sd(paired.map((d) => d.estimate));
    const independentSpread = sd(independent.map((d) => d.estimate));
    // The sample sd of 30 values has relative standard error ≈ 1/√(2·29) ≈ 0.13 (normal data;
    // e.g. Cramér 1946, §27.7); allow 3 of them.
    const allowance = 3 / Math.sqrt(2 * 29);
    expect(Math.abs(meanOf(paired.map((d) => d.pairedSE!)) / pairedSpread - 1)).toBeLessThan(allowance);
    // The independent standard error reported from the paired runs' own paths …
    expect(Math.abs(meanOf(paired.map((d) => d.independentSE)) / independentSpread - 1)).toBeLessThan(
      allowance,
    );
    // … and the one reported by independent runs.
    expect(Math.abs(meanOf(independent.map((d) => d.independentSE)) / independentSpread - 1)).toBeLessThan(
      allowance,
    );
  });
});
