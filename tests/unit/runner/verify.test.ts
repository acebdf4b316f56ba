import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseArguments, UsageError } from '../../../server/cli/args';
import { verifyCommand } from '../../../server/cli/verify-command';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheetToJson } from '@shared/run/run-sheet';
import { parseSheetDocument } from '@shared/sheet/upgrade';
import type { SimulationJson } from '@shared/run/output-json';

/** `sheet verify`, in process (the executor passed in), on the runner's small fixture sheet. */
const sheetFile = fileURLToPath(new URL('./fixtures/small-relaxation.json', import.meta.url));
let dir: string;
let run: Awaited<ReturnType<typeof runSheetToJson>>;
let simulation: SimulationJson;

beforeAll(async () => {
  dir = await mkdtemp(path.join(tmpdir(), 'meander-verify-'));
  const parsed = parseSheetDocument(JSON.parse(await readFile(sheetFile, 'utf8')));
  if (!parsed.success) throw new Error('the fixture sheet is invalid');
  run = await runSheetToJson(parsed.data, inProcessExecutor());
  simulation = run.cells.find((cell): cell is SimulationJson => cell.kind === 'simulation')!;
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function verify(digests: unknown) {
  const file = path.join(dir, `digests-${Math.random().toString(36).slice(2)}.json`);
  await writeFile(file, JSON.stringify(digests));
  return verifyCommand(
    { command: 'verify', file: sheetFile, digests: file, workers: 1, kernel: 'auto' },
    inProcessExecutor(),
  );
}

describe('sheet verify', () => {
  it('parses verify with its digests file and refuses it without one', () => {
    expect(parseArguments(['verify', 'a.json', '--digests', 'd.json'])).toEqual({
      command: 'verify',
      file: 'a.json',
      digests: 'd.json',
      workers: null,
      kernel: 'auto',
    });
    expect(() => parseArguments(['verify', 'a.json'])).toThrow(UsageError);
  });

  it('exits 0 when a version’s digests reproduce bit for bit', async () => {
    const outcome = await verify({
      engineVersion: run.engineVersion,
      digests: { [simulation.id]: simulation.digest },
    });
    expect(outcome.exitCode).toBe(0);
    expect(outcome.stdout).toBe(`${simulation.id}: reproduced bit for bit`);
  });

  it('exits 1 with a plain report when a digest differs', async () => {
    const outcome = await verify({
      engineVersion: run.engineVersion,
      digests: { [simulation.id]: '0123abcd' },
    });
    expect(outcome.exitCode).toBe(1);
    expect(outcome.stdout).toContain(`${simulation.id}: differs`);
  });

  it('compares within standard errors a run saved by another engine version', async () => {
    // The same run relabelled as made by an older engine: distance 0 SE, so it agrees.
    const older = {
      ...run,
      engineVersion: 1,
      cells: run.cells.map((cell) => ({ ...cell, engineVersion: 1 })),
    };
    const outcome = await verify(older);
    expect(outcome.exitCode).toBe(0);
    expect(outcome.stdout).toContain('saved by engine version 1');
    expect(outcome.stdout).toContain(`${simulation.id}: agrees within 0.0 SE`);
  });

  it('says what is wrong with a digests file it cannot read', async () => {
    const outcome = await verify({ digests: 'nope' });
    expect(outcome.exitCode).toBe(2);
    expect(outcome.stderr.join('\n')).toContain('neither a version');
  });
});
