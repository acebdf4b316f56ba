import { readFile } from 'node:fs/promises';
import { estimateWork } from '../../shared/engine/work';
import { runSheetToJson } from '../../shared/run/run-sheet';
import { buildSimulationPlan, type SheetDocument } from '../../shared/sheet/index';
import { scaleSheetPaths } from '../../shared/run/scale';
import type { SheetRunJson } from '../../shared/run/output-json';
import type { RunArguments } from './args';
import { createThreadPool, defaultThreadCount } from './thread-pool';
import { loadSheetText } from './validate';

/** What the command prints and returns; cli.ts does the actual writing and exiting. */
export interface CommandOutcome {
  exitCode: number;
  stdout: string;
  stderr: string[];
}

export const EXIT_OK = 0;
export const EXIT_INVALID = 1;
export const EXIT_USAGE = 2;
/** A simulation lost every path, so it (and every probe reading it) has no estimate. */
export const EXIT_NO_ESTIMATE = 3;

/** Estimates of the simulations whose work is far beyond a few minutes, printed before the run starts. */
function workNotices(doc: SheetDocument): string[] {
  return doc.cells.flatMap((cell) => {
    if (cell.kind !== 'simulation') return [];
    let estimate;
    try {
      estimate = estimateWork(buildSimulationPlan(doc, cell.id));
    } catch {
      return []; // the run itself reports what is wrong with this cell
    }
    return estimate.message === null ? [] : [`cell ${cell.id}: ${estimate.message}`];
  });
}

/** `notify` prints at once (stderr): notices a user should see before a long run, not after it. */
export async function runCommand(
  args: RunArguments,
  notify: (line: string) => void = () => {},
): Promise<CommandOutcome> {
  let text: string;
  try {
    text = await readFile(args.file, 'utf8');
  } catch (error) {
    const reason =
      (error as NodeJS.ErrnoException).code === 'ENOENT'
        ? 'no such file'
        : error instanceof Error
          ? error.message
          : String(error);
    return { exitCode: EXIT_USAGE, stdout: '', stderr: [`cannot read ${args.file}: ${reason}`] };
  }
  const validation = await loadSheetText(text);
  if (!validation.ok) {
    return {
      exitCode: EXIT_INVALID,
      stdout: '',
      stderr: [`${args.file} is not a valid sheet:`, ...validation.problems.map((p) => `  ${p}`)],
    };
  }
  const doc = args.pathsScale === null ? validation.doc : scaleSheetPaths(validation.doc, args.pathsScale);
  for (const notice of workNotices(doc)) notify(notice);
  const threads = createThreadPool(args.workers ?? defaultThreadCount(), { kernel: args.kernel });
  let output: SheetRunJson;
  try {
    output = await runSheetToJson(doc, threads.executor, { datasets: validation.datasets });
  } finally {
    await threads.close();
  }
  const failed = output.cells.flatMap((cell) => ('error' in cell ? [`cell ${cell.id}: ${cell.error}`] : []));
  const allLost = output.cells.flatMap((cell) =>
    cell.kind === 'simulation' && 'losses' in cell && cell.losses.allLost
      ? [`cell ${cell.id}: every path was lost, so it has no estimates`]
      : [],
  );
  const warnings = output.cells.flatMap((cell) =>
    'warnings' in cell ? cell.warnings.map((warning) => `warning: cell ${cell.id}: ${warning}`) : [],
  );
  return {
    exitCode: allLost.length > 0 ? EXIT_NO_ESTIMATE : failed.length > 0 ? EXIT_INVALID : EXIT_OK,
    stdout: JSON.stringify(output),
    stderr: [
      ...warnings,
      ...(failed.length > 0 ? ['some cells could not be computed:', ...failed.map((p) => `  ${p}`)] : []),
      ...allLost,
    ],
  };
}
