import { describe, expect, it } from 'vitest';
import { buildSimulationPlan, SheetIssuesError } from '@shared/sheet';
import { EXPRESSION_PRELUDE } from '@shared/expr';
import { compileGenerated } from '@shared/engine/compile-generated';
import { modelCell, ouSheet, ouWith, simulationCell } from './fixtures';

// Runs a plan's source the way the engine's generator does, through its one compile function.
function run(source: string, t: number, states: number[], noises: number[] = []): number {
  const args = ['t', ...states.map((_, i) => `s${i}`), ...noises.map((_, j) => `w${j}`)];
  return compileGenerated<(...a: number[]) => number>(args, `${EXPRESSION_PRELUDE}\nreturn ${source};`)(
    t,
    ...states,
    ...noises,
  );
}

describe('buildSimulationPlan', () => {
  it('builds the plan of a small OU sheet', () => {
    const plan = buildSimulationPlan(ouSheet(), 'run');
    expect(plan).toMatchObject({
      method: 'euler-maruyama',
      t0: 0,
      t1: 3,
      // 3 / 0.01 is 299.99999999999994 in doubles: rounded, not truncated.
      steps: 300,
      paths: 500,
      seed: 7,
      saveCount: 101,
      samplePaths: 20,
      boundaries: [{ rule: 'none' }],
      blowupBound: null,
      probeTimes: [],
      watches: [],
    });
    expect(plan.model).toMatchObject({
      stateNames: ['x'],
      noiseNames: ['W'],
      stateUnits: ['m'],
      calculus: 'ito',
      correlation: null,
      exact: [null],
      params: { theta: 1.3, mu: 0.4, sigma: 0.25 },
    });
    // x0 = 2 mu + 0.9 = 1.7 (hand computed)
    expect(plan.model.initial[0]).toBeCloseTo(1.7, 14);
    expect(plan.model.params.x0).toBeCloseTo(1.7, 14);
    // OU drift theta (mu − x) at x = 2: 1.3 · (0.4 − 2) = −2.08 (hand computed)
    expect(run(plan.model.drift[0] ?? '', 0.5, [2])).toBeCloseTo(-2.08, 14);
    expect(plan.model.diffusion).toHaveLength(1);
    expect(run(plan.model.diffusion[0]?.[0] ?? '', 0.5, [2])).toBe(0.25);
  });

  it('folds parameters in as bracketed literals and states as s0…', () => {
    const plan = buildSimulationPlan(ouSheet(), 'run');
    expect(plan.model.drift[0]).toBe('((1.3) * ((0.4) - s0))');
  });

  it('applies the simulation’s overrides, also to parameters computed from them', () => {
    const plan = buildSimulationPlan(ouWith(simulationCell({ overrides: { mu: -1 } })), 'run');
    expect(plan.model.params.mu).toBe(-1);
    // x0 = 2 · (−1) + 0.9 = −1.1 (hand computed)
    expect(plan.model.initial[0]).toBeCloseTo(-1.1, 14);
    expect(plan.model.drift[0]).toBe('((1.3) * ((-1) - s0))');
    expect(run(plan.model.drift[0] ?? '', 0, [1])).toBeCloseTo(-2.6, 14);
  });

  it('takes steps as given, or from the step size with at least one step', () => {
    expect(buildSimulationPlan(ouWith(simulationCell({ stepSize: undefined, steps: 64 })), 'run').steps).toBe(
      64,
    );
    expect(buildSimulationPlan(ouWith(simulationCell({ stepSize: 0.7 })), 'run').steps).toBe(4); // round(3 / 0.7 = 4.29)
    expect(buildSimulationPlan(ouWith(simulationCell({ stepSize: 50 })), 'run').steps).toBe(1);
  });

  it('maps noise sources, correlation, boundaries and exact solutions in model order', () => {
    const model = modelCell({
      states: [
        // Geometric Brownian motion and its closed form X_t = X_0 exp((mu − sigma²/2) t + sigma W_t)
        // (Kloeden & Platen 1992, §4.4).
        {
          name: 'x',
          initial: '1',
          drift: 'mu * x',
          diffusion: { W: 'sigma * x' },
          exact: 'x * exp((mu - sigma ** 2 / 2) * t + sigma * W)',
        },
        { name: 'y', initial: '2', drift: '-y', diffusion: { V: 'theta' } },
      ],
      noises: [{ name: 'W' }, { name: 'V' }],
      correlation: [
        [1, 0.3],
        [0.3, 1],
      ],
    });
    const sim = simulationCell({ boundaries: { y: { rule: 'reflect', level: 0 } }, blowupBound: 1e6 });
    const plan = buildSimulationPlan(ouWith(model, sim), 'run');
    expect(plan.model.stateNames).toEqual(['x', 'y']);
    expect(plan.model.noiseNames).toEqual(['W', 'V']);
    expect(plan.model.initial).toEqual([1, 2]);
    expect(plan.model.diffusion[0]?.[1]).toBe('0');
    expect(plan.model.diffusion[1]?.[0]).toBe('0');
    expect(run(plan.model.diffusion[1]?.[1] ?? '', 0, [1, 2])).toBe(1.3);
    expect(plan.model.correlation).toEqual([
      [1, 0.3],
      [0.3, 1],
    ]);
    expect(plan.boundaries).toEqual([{ rule: 'none' }, { rule: 'reflect', level: 0, side: 'below' }]);
    expect(plan.blowupBound).toBe(1e6);
    expect(plan.model.exact[1]).toBeNull();
    const t = 0.8;
    const w = -0.35;
    const x0 = 1.5;
    expect(run(plan.model.exact[0] ?? '', t, [x0, 2], [w, 0.9])).toBeCloseTo(
      x0 * Math.exp((0.4 - 0.25 ** 2 / 2) * t + 0.25 * w),
      13,
    );
  });

  it('collects probe times other than t1 and the levels probes watch', () => {
    const doc = ouWith(
      simulationCell({ boundaries: { x: { rule: 'absorb', level: -5 } } }),
      { id: 'q1', kind: 'probe', simulation: 'run', quantity: 'mean', state: 'x', time: 1.5 },
      { id: 'q2', kind: 'probe', simulation: 'run', quantity: 'variance', state: 'x', time: 3 },
      {
        id: 'q3',
        kind: 'probe',
        simulation: 'run',
        quantity: 'quantile',
        state: 'x',
        time: 0.5,
        probability: 0.9,
      },
      { id: 'q4', kind: 'probe', simulation: 'run', quantity: 'hit-before', state: 'x', level: 2 },
      { id: 'q5', kind: 'probe', simulation: 'run', quantity: 'first-passage', state: 'x', level: 2 },
      {
        id: 'q6',
        kind: 'probe',
        simulation: 'run',
        quantity: 'first-passage',
        state: 'x',
        level: -1,
        direction: 'below',
      },
      { id: 'q7', kind: 'probe', simulation: 'run', quantity: 'extinction', state: 'x', level: 0.1 },
      { id: 'q8', kind: 'probe', simulation: 'run', quantity: 'mean', state: 'x', time: 1.5 },
      {
        id: 'q9',
        kind: 'probe',
        simulation: 'run',
        quantity: 'hit-before',
        state: 'x',
        level: 2,
        monitoring: 'bgk',
      },
    );
    const plan = buildSimulationPlan(doc, 'run');
    expect(plan.probeTimes).toEqual([0.5, 1.5]);
    expect(plan.watches).toEqual([
      { state: 0, level: 2, direction: 'above', correction: 'none' },
      { state: 0, level: -1, direction: 'below', correction: 'none' },
      { state: 0, level: 0.1, direction: 'below', correction: 'none' },
      // The same level watched with the continuity correction is a watch of its own.
      { state: 0, level: 2, direction: 'above', correction: 'bgk' },
    ]);
  });

  it('throws the issues of the cells involved, listed in the error', () => {
    const doc = ouWith(
      modelCell({ states: [{ name: 'x', initial: '1', drift: 'k * x', diffusion: { W: 'sigma ^ 2' } }] }),
    );
    let thrown: unknown;
    try {
      buildSimulationPlan(doc, 'run');
    } catch (error) {
      thrown = error;
    }
    expect(thrown).toBeInstanceOf(SheetIssuesError);
    const error = thrown as SheetIssuesError;
    expect(error.issues.map((i) => i.path)).toEqual([
      ['states', 0, 'drift'],
      ['states', 0, 'diffusion', 'W'],
    ]);
    expect(error.message).toMatch(
      /^simulation 'run': 2 problems: cell m, states\[0\]\.drift: unknown name 'k'/,
    );
    expect(error.message).toContain('use ** for powers');
  });

  it('ignores problems of cells the run does not involve', () => {
    const doc = ouWith({ id: 'fan', kind: 'chart', simulation: 'run', view: 'phase', state: 'x' });
    expect(() => buildSimulationPlan(doc, 'run')).not.toThrow();
  });

  it('throws for an id that is not a simulation cell', () => {
    expect(() => buildSimulationPlan(ouSheet(), 'm')).toThrow("there is no simulation cell 'm'");
  });
});
