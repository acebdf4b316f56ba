import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { compareRerun, simulationRecord, type SimulationRecord } from '../../shared/run/compare';
import { runSheetToJson } from '../../shared/run/run-sheet';
import type { RunExecutor } from '../../shared/cells/kind';
import type { VerifyArguments } from './args';
import { EXIT_INVALID, EXIT_OK, EXIT_USAGE, type CommandOutcome } from './run-command';
import { createThreadPool, defaultThreadCount } from './thread-pool';
import { loadSheetText } from './validate';

/**
 * `verify FILE.json --digests DIGESTS.json`: reruns the sheet and compares each simulation with
 * the saved record through the same comparison the sheet page uses (shared/run/compare.ts).
 * DIGESTS.json is either what a version holds, `{ engineVersion, digests: { cellId: digest } }`,
 * or the JSON an earlier `run` printed (which also has the final means and variances, so a rerun
 * under another engine version can still be checked within standard errors).
 */

const versionDigestsFile = z.object({
  engineVersion: z.number().int().min(1).nullable(),
  digests: z.record(z.string(), z.string().min(1)),
});
const moments = z.object({ mean: z.number().nullable(), variance: z.number().nullable() });
const runOutputFile = z.object({
  engineVersion: z.number().int().min(1),
  cells: z.array(
    z.union([
      z.object({
        id: z.string(),
        kind: z.literal('simulation'),
        paths: z.number().int(),
        final: z.record(z.string(), moments),
        losses: z.object({ count: z.number().int() }),
        digest: z.string(),
        engineVersion: z.number().int(),
      }),
      z.object({ id: z.string(), kind: z.string() }),
    ]),
  ),
});

/** The saved records by simulation cell id, or the reason the file cannot be read. */
export function readSavedRecords(text: string): Record<string, SimulationRecord> | string {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    return `not JSON (${error instanceof Error ? error.message : String(error)})`;
  }
  const version = versionDigestsFile.safeParse(raw);
  if (version.success) {
    const records: Record<string, SimulationRecord> = {};
    for (const [cellId, digest] of Object.entries(version.data.digests)) {
      records[cellId] = { digest, engineVersion: version.data.engineVersion };
    }
    return records;
  }
  const run = runOutputFile.safeParse(raw);
  if (run.success) {
    const records: Record<string, SimulationRecord> = {};
    for (const cell of run.data.cells) {
      if ('digest' in cell) {
        records[cell.id] = {
          digest: cell.digest,
          engineVersion: cell.engineVersion,
          paths: cell.paths - cell.losses.count,
          final: cell.final,
        };
      }
    }
    return records;
  }
  return 'neither a version\'s { "engineVersion", "digests" } nor the JSON of "sheet run"';
}

async function readText(file: string): Promise<string | { problem: string }> {
  try {
    return await readFile(file, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    return { problem: `cannot read ${file}: ${code === 'ENOENT' ? 'no such file' : String(error)}` };
  }
}

export async function verifyCommand(args: VerifyArguments, executor?: RunExecutor): Promise<CommandOutcome> {
  const [sheetText, digestsText] = await Promise.all([readText(args.file), readText(args.digests)]);
  if (typeof sheetText !== 'string') return { exitCode: EXIT_USAGE, stdout: '', stderr: [sheetText.problem] };
  if (typeof digestsText !== 'string')
    return { exitCode: EXIT_USAGE, stdout: '', stderr: [digestsText.problem] };
  const validation = await loadSheetText(sheetText);
  if (!validation.ok) {
    return {
      exitCode: EXIT_INVALID,
      stdout: '',
      stderr: [`${args.file} is not a valid sheet:`, ...validation.problems.map((p) => `  ${p}`)],
    };
  }
  const saved = readSavedRecords(digestsText);
  if (typeof saved === 'string') {
    return { exitCode: EXIT_USAGE, stdout: '', stderr: [`${args.digests} is ${saved}`] };
  }
  const threads = executor
    ? null
    : createThreadPool(args.workers ?? defaultThreadCount(), { kernel: args.kernel });
  let rerun: Record<string, SimulationRecord>;
  try {
    const output = await runSheetToJson(validation.doc, executor ?? threads!.executor, {
      datasets: validation.datasets,
    });
    rerun = {};
    for (const cell of output.cells)
      if (cell.kind === 'simulation' && 'digest' in cell) rerun[cell.id] = simulationRecord(cell);
  } finally {
    await threads?.close();
  }
  const result = compareRerun(saved, rerun);
  const lines = [
    ...(result.engineChanged
      ? [
          `saved by engine version ${result.savedEngineVersion}, rerun by engine version ${result.rerunEngineVersion}: ` +
            'comparing final means and variances within their Monte Carlo standard errors',
        ]
      : []),
    ...result.checks.map((check) => `${check.cellId}: ${check.message}`),
    ...(result.checks.length === 0 ? ['no saved digests to compare'] : []),
  ];
  const good = result.allGood && result.checks.length > 0;
  return {
    exitCode: good ? EXIT_OK : EXIT_INVALID,
    stdout: lines.join('\n'),
    stderr: good ? [] : ['not every simulation reproduced (see the report on stdout)'],
  };
}
