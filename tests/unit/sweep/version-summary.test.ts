import { describe, expect, it } from 'vitest';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet } from '@shared/run/run-sheet';
import { scenariosTable } from '@shared/run/scenarios-result';
import { sweepTable } from '@shared/run/sweep-result';
import { outputsFromResults, summariseResults, versionResultsSchema } from '@shared/run/version-results';
import { sheetCellDependencies } from '@shared/sheet/dependencies';
import { sheetFingerprints } from '@shared/sheet/fingerprint';
import { sheet } from './sheets';

/** A small logistic stock with a sweep (and its target) and three plans, saved with a version and read back. */
const doc = sheet({
  params: { r: 0.6, K: 50, h: 0.1, s: 0.35 },
  drift: 'r * X * (1 - X / K) - h * X',
  diffusion: 's * X',
  initial: '20',
  t1: 10,
  steps: 100,
  paths: 400,
  boundaries: { X: { rule: 'absorb', level: 1, side: 'below' } },
  probes: [{ id: 'gone', quantity: 'extinction' }],
  cells: [
    {
      id: 'sw',
      kind: 'sweep',
      probe: 'gone',
      axes: [{ parameter: 'h', spacing: 'linear', from: 0, to: 0.6, count: 4, values: [] }],
      target: { value: 0.2, refineRuns: 2 },
    },
    {
      id: 'plans',
      kind: 'scenarios',
      simulation: 'sim',
      probes: ['gone'],
      scenarios: [
        { name: 'now', overrides: {} },
        { name: 'less', overrides: { h: 0.05 } },
        { name: 'more', overrides: { h: 0.3 } },
      ],
      baseline: 'now',
    },
  ],
});

describe('sweeps and scenarios saved with a version', () => {
  it('come back with the same tables and target after a trip through JSON', async () => {
    const run = await runSheet(doc, { executor: inProcessExecutor() });
    const fingerprints = sheetFingerprints(doc, sheetCellDependencies(doc));
    const saved = summariseResults(doc, (id) => run.outputs.get(id), fingerprints);
    const parsed = versionResultsSchema.parse(JSON.parse(JSON.stringify(saved)));
    const restored = outputsFromResults(doc, parsed, () => null, new Date());

    const sweep = run.outputs.get('sw')!.output;
    const sweepBack = restored.get('sw');
    if (sweep.kind !== 'sweep' || sweepBack?.kind !== 'sweep') throw new Error('no sweep');
    expect(sweepTable(sweepBack.result)).toEqual(sweepTable(sweep.result));
    expect(sweepBack.result.target).toEqual(sweep.result.target);

    const plans = run.outputs.get('plans')!.output;
    const plansBack = restored.get('plans');
    if (plans.kind !== 'scenarios' || plansBack?.kind !== 'scenarios') throw new Error('no scenarios');
    expect(scenariosTable(plansBack.result)).toEqual(scenariosTable(plans.result));
    expect(plansBack.result.scenarios[2]!.fan[0]!.q50).toEqual(plans.result.scenarios[2]!.fan[0]!.q50);
  });
});
