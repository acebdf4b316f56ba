import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { exampleSheets } from '@shared/examples/index';

/**
 * The headless runner as a user runs it: a child process (tsx server/cli.ts …), stdout parsed as
 * JSON. Path counts are scaled down so each run takes a second or two.
 */
const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));
const fixture = (name: string) => fileURLToPath(new URL(`./fixtures/${name}`, import.meta.url));

interface CliRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** `until`: stop the runner (SIGTERM) as soon as stderr matches, for runs too long to finish in a test. */
function runCli(args: string[], until?: RegExp): Promise<CliRun> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['node_modules/tsx/dist/cli.mjs', 'server/cli.ts', ...args], {
      cwd: repoRoot,
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => {
      stderr += chunk.toString();
      if (until !== undefined && until.test(stderr)) child.kill('SIGTERM');
    });
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

const nullableNumber = z.number().nullable();
const quantiles = z
  .object({
    '5': nullableNumber,
    '25': nullableNumber,
    '50': nullableNumber,
    '75': nullableNumber,
    '95': nullableNumber,
  })
  .strict();
const simulationOutput = z
  .object({
    id: z.string(),
    kind: z.literal('simulation'),
    method: z.enum(['euler-maruyama', 'milstein', 'heun']),
    paths: z.number().int().positive(),
    steps: z.number().int().positive(),
    warnings: z.array(z.string()),
    final: z.record(
      z.string(),
      z.object({ mean: nullableNumber, variance: nullableNumber, quantiles }).strict(),
    ),
    finalCovariance: z.array(z.array(nullableNumber)).nullable(),
    losses: z
      .object({
        count: z.number().int().min(0),
        share: z.number().min(0).max(1),
        byCause: z
          .object({ domain: z.number().int(), infinite: z.number().int(), bound: z.number().int() })
          .strict(),
        firstTime: nullableNumber,
        conditional: z.boolean(),
        allLost: z.boolean(),
        message: z.string().nullable(),
        advice: z.array(z.string()),
      })
      .strict(),
    stability: z
      .object({
        check: z.enum(['mean-square', 'linear-drift']),
        stable: z.boolean(),
        modelStable: z.boolean(),
        h: z.number(),
        amplification: nullableNumber,
        lambda: nullableNumber,
        lambdaImag: nullableNumber,
        time: z.number(),
        maxStableStep: nullableNumber,
        message: z.string(),
      })
      .strict()
      .nullable(),
    digest: z.string().regex(/^[0-9a-f]{16}$/),
    engineVersion: z.number().int().min(1),
    kernel: z.enum(['js', 'wasm']),
    kernelNote: z.string().optional(),
  })
  .strict();
const probeOutput = z
  .object({
    id: z.string(),
    kind: z.literal('probe'),
    estimate: nullableNumber,
    standardError: nullableNumber,
    ci: z.tuple([nullableNumber, nullableNumber]),
    paths: z.number().int().min(0),
    warnings: z.array(z.string()),
    note: z.string().optional(),
    monitoring: z.string().optional(),
  })
  .strict();
const failedOutput = z
  .object({
    id: z.string(),
    kind: z.enum(['simulation', 'probe', 'study', 'sweep', 'scenarios']),
    error: z.string(),
  })
  .strict();
const studyLevel = z
  .object({
    steps: z.number().int(),
    h: z.number(),
    strongError: nullableNumber,
    strongSE: nullableNumber,
    weakError: nullableNumber,
    weakSE: nullableNumber,
  })
  .strict();
const studyOutput = z
  .object({
    id: z.string(),
    kind: z.literal('study'),
    strongOrder: nullableNumber,
    strongOrderSE: nullableNumber,
    strongOrderCI: z.tuple([nullableNumber, nullableNumber]),
    weakOrder: nullableNumber,
    weakOrderSE: nullableNumber,
    weakOrderCI: z.tuple([nullableNumber, nullableNumber]),
    reference: z.enum(['exact', 'finest']),
    levels: z.array(studyLevel).min(3),
    note: z.string().optional(),
  })
  .strict();
const tableRow = z.record(z.string(), z.union([z.number(), z.string(), z.null()]));
const sweepOutput = z
  .object({
    id: z.string(),
    kind: z.literal('sweep'),
    probe: z.string(),
    parameters: z.array(z.string()).min(1).max(2),
    commonRandomNumbers: z.boolean(),
    pathsPerPoint: z.number().int().min(1),
    table: z.array(tableRow).min(1),
    target: z
      .object({
        value: z.number(),
        bracketed: z.boolean(),
        root: nullableNumber,
        interval: z.tuple([z.number(), z.number()]).nullable(),
        message: z.string(),
      })
      .strict()
      .nullable(),
  })
  .strict();
const scenariosOutput = z
  .object({
    id: z.string(),
    kind: z.literal('scenarios'),
    baseline: z.string(),
    commonRandomNumbers: z.boolean(),
    table: z.array(tableRow),
  })
  .strict();
const runOutput = z
  .object({
    title: z.string(),
    engineVersion: z.number().int().min(1),
    cells: z.array(
      z.union([simulationOutput, probeOutput, studyOutput, sweepOutput, scenariosOutput, failedOutput]),
    ),
  })
  .strict();

type RunOutput = z.infer<typeof runOutput>;
type ComputedCell = Exclude<RunOutput['cells'][number], { error: string }>;

/** The output of cell `id`, which must have been computed (not failed). */
function computedCell(output: RunOutput, id: string): ComputedCell {
  const cell = output.cells.find((c) => c.id === id);
  if (cell === undefined || 'error' in cell) throw new Error(`cell ${id} has no computed output`);
  return cell;
}

describe('sheet run (command line)', () => {
  for (const example of exampleSheets) {
    it(`prints the documented JSON for the ${example.slug} example`, async () => {
      const result = await runCli([
        'run',
        `shared/examples/${example.slug}.json`,
        '--paths-scale',
        '0.02',
        '--workers',
        '2',
      ]);
      expect(result.stderr).toBe('');
      expect(result.code).toBe(0);
      expect(result.stdout.trim().split('\n')).toHaveLength(1);
      const output = runOutput.parse(JSON.parse(result.stdout));
      expect(output.title).toBe(example.document.title);
      // One output per numerical cell, in document order.
      const numerical = example.document.cells.filter(
        (c) =>
          c.kind === 'simulation' ||
          c.kind === 'probe' ||
          c.kind === 'study' ||
          c.kind === 'sweep' ||
          c.kind === 'scenarios',
      );
      expect(output.cells.map((c) => [c.id, c.kind])).toEqual(numerical.map((c) => [c.id, c.kind]));
      for (const cell of output.cells) {
        if ('error' in cell) throw new Error(`cell ${cell.id} failed: ${cell.error}`);
        if (cell.kind === 'simulation') {
          const source = numerical.find((c) => c.id === cell.id);
          expect(source?.kind === 'simulation' && Math.max(1, Math.round(source.paths * 0.02))).toBe(
            cell.paths,
          );
        }
        if (cell.kind === 'probe') {
          expect(cell.ci[0]!).toBeLessThanOrEqual(cell.estimate!);
          expect(cell.ci[1]!).toBeGreaterThanOrEqual(cell.estimate!);
        }
      }
    });
  }

  it('gives the same digest and numbers with one worker and with two', async () => {
    const one = await runCli(['run', fixture('small-relaxation.json'), '--workers', '1']);
    const two = await runCli(['run', fixture('small-relaxation.json'), '--workers', '2']);
    expect(one.code).toBe(0);
    expect(two.code).toBe(0);
    const sim = (stdout: string) =>
      runOutput.parse(JSON.parse(stdout)).cells.find((c) => c.kind === 'simulation');
    expect(sim(one.stdout)).toBeDefined();
    expect(sim(one.stdout)).toEqual(sim(two.stdout));
    expect(JSON.parse(one.stdout)).toEqual(JSON.parse(two.stdout));
  });

  it('gives the same digest on the wasm kernel and the JavaScript kernel, and says which ran', async () => {
    const wasm = await runCli([
      'run',
      fixture('small-relaxation.json'),
      '--workers',
      '1',
      '--kernel',
      'wasm',
    ]);
    const js = await runCli(['run', fixture('small-relaxation.json'), '--workers', '1', '--kernel', 'js']);
    const sim = (stdout: string) =>
      runOutput.parse(JSON.parse(stdout)).cells.find((c) => c.kind === 'simulation') as
        { kernel: string; digest: string } | undefined;
    expect(sim(wasm.stdout)?.kernel).toBe('wasm');
    expect(sim(js.stdout)?.kernel).toBe('js');
    expect(sim(wasm.stdout)?.digest).toBe(sim(js.stdout)?.digest);
  });

  it('exits 1 on an invalid sheet, naming the cell and the field on stderr, with nothing on stdout', async () => {
    const result = await runCli(['run', fixture('unknown-name.json')]);
    expect(result.code).toBe(1);
    expect(result.stdout).toBe('');
    expect(result.stderr).toMatch(/cell gauge-model, states\[0\]\.drift: .*offset/);
  });

  it('exits 2 on a usage error and on a missing file, with nothing on stdout', async () => {
    const noFile = await runCli(['run']);
    expect(noFile.code).toBe(2);
    expect(noFile.stdout).toBe('');
    expect(noFile.stderr).toMatch(/needs a sheet file/);
    const badWorkers = await runCli(['run', fixture('small-relaxation.json'), '--workers', 'many']);
    expect(badWorkers.code).toBe(2);
    expect(badWorkers.stderr).toMatch(/--workers must be a positive whole number/);
    const missing = await runCli(['run', 'no-such-sheet.json']);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/cannot read no-such-sheet\.json: no such file/);
  });

  it('refuses a step size that resolves to more steps than the cap, as an invalid sheet', async () => {
    const result = await runCli(['run', fixture('step-size-beyond-cap.json')]);
    expect(result.code).toBe(1);
    expect(result.stdout).toBe('');
    expect(result.stderr).toMatch(
      /cell gauge-run, stepSize: .*gives 20,000,000 steps, more than the limit of 10,000,000/,
    );
  });

  it('prints the work estimate of a run far beyond a few minutes before it starts', async () => {
    const result = await runCli(['run', fixture('huge-work.json'), '--workers', '1'], /path-steps/);
    expect(result.stdout).toBe('');
    expect(result.stderr).toMatch(
      /cell gauge-run: this run is 1\.00e\+14 path-steps, roughly \d+ days on one core/,
    );
  });

  it('marks every estimate of a Feller-violating CIR run as conditional, with the advice for a square root', async () => {
    const result = await runCli(['run', fixture('feller-violated-cir.json'), '--workers', '2']);
    expect(result.code).toBe(0);
    const output = runOutput.parse(JSON.parse(result.stdout));
    const sim = computedCell(output, 'rate-run');
    const probe = computedCell(output, 'rate-mean');
    if (sim?.kind !== 'simulation' || probe?.kind !== 'probe') throw new Error('missing outputs');
    expect(sim.losses.byCause.domain).toBeGreaterThan(sim.paths / 2);
    expect(sim.losses.byCause.bound + sim.losses.byCause.infinite).toBe(0);
    expect(sim.losses.conditional).toBe(true);
    expect(sim.warnings.join(' ')).toMatch(/conditional on the [\d,]+ surviving paths/);
    expect(sim.warnings.join(' ')).toMatch(/sqrt\(max\(r, 0\)\)/);
    expect(probe.warnings.join(' ')).toMatch(/conditional on the [\d,]+ surviving paths/);
    expect(result.stderr).toMatch(/warning: cell rate-mean: conditional on/);
  });

  it('exits 3 with no estimates when every path is lost', async () => {
    const result = await runCli(['run', fixture('every-path-lost.json'), '--workers', '1']);
    expect(result.code).toBe(3);
    const output = runOutput.parse(JSON.parse(result.stdout));
    const sim = computedCell(output, 'stock-run');
    const probe = output.cells.find((c) => c.id === 'stock-mean');
    if (sim?.kind !== 'simulation') throw new Error('missing simulation output');
    expect(sim.losses.allLost).toBe(true);
    expect(sim.losses.advice.join(' ')).toMatch(/logarithm in the drift of N/);
    expect(Object.values(sim.final).every((summary) => summary.mean === null)).toBe(true);
    expect(probe && 'error' in probe ? probe.error : '').toMatch(/no estimate: every path was lost/);
    expect(result.stderr).toMatch(/cell stock-run: every path was lost, so it has no estimates/);
  });

  it('says a stiff linear model at hλ = −10 is unstable, in the simulation and in every probe', async () => {
    const result = await runCli(['run', fixture('stiff-linear-large-step.json'), '--workers', '1']);
    expect(result.code).toBe(0);
    const output = runOutput.parse(JSON.parse(result.stdout));
    const sim = computedCell(output, 'lag-run');
    const probe = computedCell(output, 'lag-mean');
    if (sim.kind !== 'simulation' || probe.kind !== 'probe') throw new Error('unexpected kinds');
    expect(sim.stability).toMatchObject({ check: 'linear-drift', stable: false, modelStable: true });
    expect(sim.stability!.maxStableStep).toBeCloseTo(0.02, 6); // h < 2/|λ| for Euler's step
    expect(sim.warnings[0]).toMatch(/NOT stable .*\(hλ = −10\)/);
    // The warnings come before the numbers they qualify, in the JSON text too.
    expect(result.stdout.indexOf('NOT stable')).toBeLessThan(result.stdout.indexOf('"final"'));
    expect(probe.warnings.join(' ')).toMatch(/step is unstable/);
    expect(result.stderr).toMatch(/warning: cell lag-run: Euler–Maruyama with step 0\.1 is NOT stable/);
  });
});
