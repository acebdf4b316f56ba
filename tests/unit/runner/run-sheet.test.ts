import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { RunCancelledError } from '@shared/run/chunk-pool';
import type { RunExecutor } from '@shared/cells/kind';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet, runSheetToJson } from '@shared/run/run-sheet';
import type { CellOutputJson } from '@shared/run/output-json';
import { simulate } from '@shared/engine/simulate';
import { buildSimulationPlan, sheetDocumentSchema } from '@shared/sheet/index';

const fixture = sheetDocumentSchema.parse(
  JSON.parse(readFileSync(new URL('./fixtures/small-relaxation.json', import.meta.url), 'utf8')),
);

/** Counts what the runner asks of its environment. */
function countingExecutor(inner: RunExecutor = inProcessExecutor()) {
  const calls = { simulations: 0, studies: 0 };
  const env: RunExecutor = {
    runSimulation: (plan, onProgress) => {
      calls.simulations++;
      return inner.runSimulation(plan, onProgress);
    },
    runStudy: (plan, options, onProgress) => {
      calls.studies++;
      return inner.runStudy(plan, options, onProgress);
    },
  };
  return { env, calls };
}

describe('runSheet (the orchestrator, through its JSON view)', () => {
  it('runs a simulation once, on demand, even when its probe comes first, and lists outputs in document order', async () => {
    const { env, calls } = countingExecutor();
    const seen: string[] = [];
    const output = await runSheetToJson(fixture, env, { onCellOutput: (cellId) => seen.push(cellId) });
    expect(output.title).toBe(fixture.title);
    expect(output.cells.map((c) => c.id)).toEqual(['gauge-probe', 'gauge-run', 'gauge-study']);
    // Outputs arrive as they are computed: the simulation before the probe that reads it.
    expect(seen).toEqual(['gauge-run', 'gauge-probe', 'gauge-study']);
    expect(calls).toEqual({ simulations: 1, studies: 1 });
    expect(output.cells.every((c) => !('error' in c))).toBe(true);
  });

  it('reports the same digest as the engine running the whole plan in one piece', async () => {
    const output = await runSheetToJson(fixture, inProcessExecutor());
    const sim = output.cells.find(
      (c): c is Extract<CellOutputJson, { kind: 'simulation' }> => c.kind === 'simulation',
    );
    const whole = simulate(buildSimulationPlan(fixture, 'gauge-run'));
    expect(sim?.digest).toBe(whole.digest);
    expect(sim?.paths).toBe(3000);
  });

  it('summarises the final distribution close to the Ornstein–Uhlenbeck law', async () => {
    const output = await runSheetToJson(fixture, inProcessExecutor());
    const sim = output.cells.find(
      (c): c is Extract<CellOutputJson, { kind: 'simulation' }> => c.kind === 'simulation',
    )!;
    const summary = sim.final.Y!;
    // OU mean m + (Y0 − m) e^{−kT} and variance v²(1 − e^{−2kT})/(2k) (Kloeden & Platen 1992, §4.4).
    const k = 0.7,
      m = -1.5,
      v = 0.45,
      y0 = 0.6,
      T = 2;
    const mean = m + (y0 - m) * Math.exp(-k * T);
    const variance = ((v * v) / (2 * k)) * (1 - Math.exp(-2 * k * T));
    // Tolerances: 5 standard errors of the sample mean and variance (normal data: Var(s²) = 2σ⁴/(n−1)),
    // plus the Euler–Maruyama bias at h = 0.01, well below 0.01 here (common practice, no source).
    expect(Math.abs(summary.mean! - mean)).toBeLessThan(5 * Math.sqrt(variance / 3000) + 0.01);
    expect(Math.abs(summary.variance! - variance)).toBeLessThan(5 * variance * Math.sqrt(2 / 2999) + 0.01);
    expect(summary.quantiles['5']!).toBeLessThan(summary.quantiles['50']!);
    expect(summary.quantiles['50']!).toBeLessThan(summary.quantiles['95']!);
  });

  it('reports progress per cell', async () => {
    const progress: { cellId: string; pathsDone: number }[] = [];
    await runSheetToJson(fixture, inProcessExecutor(), {
      onProgress: (cellId, p) => progress.push({ cellId, pathsDone: p.pathsDone }),
    });
    expect(progress.length).toBeGreaterThan(1);
    expect(progress.every((p) => p.cellId === 'gauge-run')).toBe(true);
    expect(progress[progress.length - 1]!.pathsDone).toBe(3000);
  });

  it('records a failing cell with its message and still computes the others', async () => {
    const inner = inProcessExecutor();
    const env: RunExecutor = {
      runSimulation: inner.runSimulation,
      runStudy: () => Promise.reject(new Error('the study ran out of memory')),
    };
    const output = await runSheetToJson(fixture, env);
    expect(output.cells.find((c) => c.id === 'gauge-study')).toEqual({
      id: 'gauge-study',
      kind: 'study',
      error: 'the study ran out of memory',
    });
    expect(output.cells.find((c) => c.id === 'gauge-run')).toHaveProperty('digest');
  });

  it('stops the whole run on a cancel instead of recording it as a failed cell', async () => {
    const env: RunExecutor = {
      runSimulation: () => Promise.reject(new RunCancelledError()),
      runStudy: () => Promise.reject(new Error('should not be reached')),
    };
    await expect(runSheetToJson(fixture, env)).rejects.toBeInstanceOf(RunCancelledError);
  });
});

describe('run failures in words', () => {
  it('names the cell by its title and the field by its label, never by internal ids', async () => {
    const doc = structuredClone(fixture);
    const model = doc.cells.find((cell) => cell.kind === 'model')!;
    if (model.kind !== 'model') throw new Error('fixture');
    model.name = 'Mean-reverting anomaly';
    model.states[0]!.drift = 'theta * (mu - nosuch)';
    const run = await runSheet(doc, { executor: inProcessExecutor() });
    const failed = [...run.outputs.values()].find((kept) => kept.output.kind === 'error')!.output;
    if (failed.kind !== 'error') throw new Error('expected a failure');
    expect(failed.message).toContain(`Model 'Mean-reverting anomaly', drift of ${model.states[0]!.name}:`);
    expect(failed.message).not.toContain(`cell ${model.id}`);
    expect(failed.message).not.toContain('states[0]');
  });
});
