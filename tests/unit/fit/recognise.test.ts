import { describe, expect, it } from 'vitest';
import { exactAvailability, buildFitProblem } from '@shared/fit/build-problem';
import { compileFitModel } from '@shared/fit/compile';
import { buildLikelihood, fitModel } from '@shared/fit/fit-model';
import { transitionsOf } from '@shared/fit/transitions';
import { RunCancelledError } from '@shared/run/chunk-pool';
import { issueInWords } from '@shared/sheet/issue-words';
import { checkSheet, sheetDocumentSchema, type FitCell } from '@shared/sheet';
import { evenTimes, fitSheet, generator, observedOf, ouProblem, ouSeries } from './fixtures';

describe('which models have an exact likelihood', () => {
  const sheet = (drift: string, diffusion: string) =>
    fitSheet({
      params: [
        { name: 'a', value: 0.5 },
        { name: 'b', value: 0.3, min: 0 },
      ],
      drift,
      diffusion,
      estimate: ['a', 'b'],
      method: 'euler',
    }).doc;

  it.each([
    ['a * (2 - X)', 'b', 'linear'],
    ['-a * X + 3', 'b * 2', 'linear'],
    ['a * X', 'b * X', 'gbm'],
    ['a * X * X', 'b', null],
    ['a * (1 - X)', 'b * sqrt(X)', null],
    ['a * sin(t)', 'b', null],
    ['a + X', 'b * X', null],
  ])('drift %s, diffusion %s: %s', (drift, diffusion, form) => {
    expect(exactAvailability(sheet(drift, diffusion), 'm').form).toBe(form);
  });

  it('names the reason when the diffusion is not constant, and the checker puts it on the likelihood field', () => {
    const { doc } = fitSheet({
      params: [{ name: 'b', value: 0.3, min: 0 }],
      drift: '1 - X',
      diffusion: 'b * sqrt(X)',
      estimate: ['b'],
      method: 'exact',
    });
    const issue = checkSheet(doc).find((i) => i.cellId === 'f');
    expect(issue && issueInWords(doc, issue)).toMatch(
      /^Fit 'b by exact likelihood', likelihood: the exact likelihood is not available: the diffusion is neither constant nor proportional to the state/,
    );
  });
});

describe('the exact likelihood of a linear system with several states', () => {
  it('equals the sum of the one-state likelihoods when the states do not interact (Van Loan blocks against closed forms)', () => {
    // Two independent OU states: the joint transition density factorises (common practice, no source).
    const doc = sheetDocumentSchema.parse({
      schemaVersion: 1,
      title: 'two ponds',
      cells: [
        {
          id: 'p',
          kind: 'params',
          params: [
            { name: 'k1', value: 0.7, min: 0 },
            { name: 'k2', value: 1.9, min: 0 },
            { name: 's1', value: 0.3, min: 0 },
            { name: 's2', value: 0.6, min: 0 },
          ],
        },
        {
          id: 'm',
          kind: 'model',
          states: [
            { name: 'X', initial: '1', drift: 'k1 * (1 - X)', diffusion: { W: 's1' } },
            { name: 'Y', initial: '0', drift: '-k2 * Y', diffusion: { V: 's2' } },
          ],
          noises: [{ name: 'W' }, { name: 'V' }],
        },
        {
          id: 'd',
          kind: 'data',
          dataset: null,
          model: 'm',
          timeColumn: 't',
          columns: [
            { column: 'X', state: 'X', unit: '' },
            { column: 'Y', state: 'Y', unit: '' },
          ],
        },
        {
          id: 'f',
          kind: 'fit',
          data: 'd',
          model: 'm',
          parameters: ['k1', 'k2', 's1', 's2'],
          method: 'exact',
        },
      ],
    });
    const cell = doc.cells.find((c): c is FitCell => c.kind === 'fit')!;
    const n = 60;
    const times = [0, ...Array.from({ length: n - 1 }, (_, i) => 0.3 + i * 0.45 + (i % 3) * 0.2)];
    const xs = ouSeries(generator(11), { kappa: 0.7, mu: 1, sigma: 0.3 }, n, 0.4, 1);
    const ys = ouSeries(generator(12), { kappa: 1.9, mu: 0, sigma: 0.6 }, n, 0.4, 0);
    const observed = {
      ...observedOf('X', [{ times, values: xs }]),
      columns: [
        { column: 'X', state: 'X', unit: '' },
        { column: 'Y', state: 'Y', unit: '' },
      ],
      series: [{ group: null, times, values: { X: xs, Y: ys } }],
    };
    const problem = buildFitProblem(doc, cell, observed);
    expect(problem.exactForm).toBe('linear');
    const joint = buildLikelihood(problem, compileFitModel(problem.model), transitionsOf(problem.series, 2));
    const one = (values: number[], kappa: number, mu: number, sigma: number) => {
      const p = ouProblem([{ times, values }], 'exact', { kappa, mu, sigma });
      return buildLikelihood(p, compileFitModel(p.model), transitionsOf(p.series, 1)).logLikelihood(
        Float64Array.of(kappa, mu, sigma),
      );
    };
    const expected = one(xs, 0.7, 1, 0.3) + one(ys, 1.9, 0, 0.6);
    expect(joint.logLikelihood(Float64Array.of(0.7, 1.9, 0.3, 0.6))).toBeCloseTo(expected, 8);
  });
});

describe('a fit in progress', () => {
  it('reports progress in likelihood evaluations and stops when asked', () => {
    const values = ouSeries(generator(9), { kappa: 1, mu: 0, sigma: 0.5 }, 400, 0.5, 0);
    const problem = ouProblem([{ times: evenTimes(400, 0.5), values }], 'simulated', undefined, {
      subSteps: 16,
      draws: 64,
    });
    const units: string[] = [];
    expect(() =>
      fitModel(problem, {
        onProgress: (p) => units.push(p.unit ?? 'paths'),
        shouldStop: () => units.length >= 1,
      }),
    ).toThrow(RunCancelledError);
    expect(units[0]).toBe('likelihood evaluations');
  });

  it('says plainly when a starting value sits on its bound', () => {
    const values = ouSeries(generator(9), { kappa: 1, mu: 0, sigma: 0.5 }, 50, 0.5, 0);
    const problem = ouProblem([{ times: evenTimes(50, 0.5), values }], 'exact', {
      kappa: 1,
      mu: 0,
      sigma: 0,
    });
    expect(() => fitModel(problem)).toThrow(
      /the starting value of sigma \(0\) is on or below its minimum 0; start it inside its range/,
    );
  });
});

describe('the simulated likelihood', () => {
  it('gives the same value on its one-state fast path as on the general path (a second, silent noise source)', () => {
    const times = evenTimes(40, 0.7);
    const values = ouSeries(generator(21), { kappa: 0.9, mu: 1, sigma: 0.4 }, 40, 0.7, 1.5);
    const fast = ouProblem([{ times, values }], 'simulated', undefined, { subSteps: 6, draws: 10, seed: 3 });
    const general = structuredClone(fast);
    general.model.noiseCount = 2;
    general.model.diffusion = [[fast.model.diffusion[0]![0]!, '0']];
    const value = (problem: typeof fast) =>
      buildLikelihood(
        problem,
        compileFitModel(problem.model),
        transitionsOf(problem.series, 1),
      ).logLikelihood(Float64Array.of(0.8, 1.1, 0.45));
    // Same draws, same formula (Durham & Gallant 2002, the modified Brownian bridge), two implementations.
    expect(value(fast)).toBeCloseTo(value(general), 9);
  });
});
