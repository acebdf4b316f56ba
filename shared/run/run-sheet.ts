import { kindOf } from '../cells/registry';
import type { RunExecutor, RunStepContext } from '../cells/kind';
import type { DatasetProvider } from '../data/provider';
import { ENGINE_VERSION } from '../engine/version';
import type { SimulationPlan } from '../engine/plan';
import { sheetCellDependencies } from '../sheet/dependencies';
import type { SheetDocument } from '../sheet/document';
import { sheetFingerprints } from '../sheet/fingerprint';
import { SheetIssuesError } from '../sheet/issues';
import { issueInWords } from '../sheet/issue-words';
import { buildSimulationPlan, varyingParameters } from '../sheet/plan';
import { RunCancelledError } from './chunk-pool';
import type { VersionMoments } from '../api/sheets';
import { simulationRecord } from './compare';
import { type CellOutput } from './outputs';
import { cellOutputJson, type SheetRunJson } from './output-json';
import type { RunProgress } from './progress';
import { planRunSteps, type RunStep } from './steps';

/**
 * The one run orchestrator: the browser's sheet page, the command-line runner and the tests all
 * run a sheet through `runSheet`. It plans the steps (./steps.ts), reuses outputs whose inputs have
 * not changed, and runs each step through its kind's run step (shared/cells) on the executor the
 * caller gives: the browser's worker pool, worker_threads, or the calling thread. A failing step
 * leaves an error output on its own cell and the run goes on; a cancel stops the run and keeps
 * the outputs finished before it.
 */

/** An output with the fingerprint of the inputs it was computed from. */
export interface KeptOutput {
  output: CellOutput;
  fingerprint: string;
}

export interface RunSheetOptions {
  executor: RunExecutor;
  /** null or absent: every cell that computes; else the cell the person asked to run. */
  target?: string | null;
  /** Fingerprints of the document's cells now; computed from the document when absent. */
  fingerprints?: Readonly<Record<string, string>>;
  /** Outputs of earlier runs, reused where their fingerprint still matches. */
  kept?: (cellId: string) => KeptOutput | undefined;
  /** Where data cells read their datasets' rows. */
  datasets?: DatasetProvider;
  onStepStart?(step: RunStep): void;
  onProgress?(cellId: string, progress: RunProgress): void;
  onCellOutput?(cellId: string, kept: KeptOutput): void;
  /** Asked between steps and after a failure; the caller's cancel also stops the executor. */
  isCancelled?(): boolean;
}

export interface SheetRun {
  /** This run's outputs (computed or reused), by cell id. */
  outputs: Map<string, KeptOutput>;
  cancelled: boolean;
  engineVersion: number;
}

/** True for a user's cancel, which stops the whole run instead of failing one cell. */
export function isCancellation(error: unknown): boolean {
  return error instanceof Error && error.name === 'RunCancelledError';
}

/**
 * A thrown value in plain words for the cell that caused it. Problems found in the sheet name
 * their cells by title and their fields by label (shared/sheet/issue-words.ts), never by id.
 */
export function describeRunError(error: unknown, doc?: SheetDocument): string {
  if (doc && error instanceof SheetIssuesError && error.issues.length > 0)
    return error.issues.map((issue) => issueInWords(doc, issue)).join('; ');
  if (error instanceof Error && error.message) return error.message;
  if (typeof error === 'string' && error) return error;
  return 'the run failed for an unknown reason';
}

export async function runSheet(doc: SheetDocument, options: RunSheetOptions): Promise<SheetRun> {
  const dependencies = sheetCellDependencies(doc);
  const fingerprints = options.fingerprints ?? sheetFingerprints(doc, dependencies);
  const steps = planRunSteps(doc, options.target ?? null, dependencies);
  const byId = new Map(doc.cells.map((cell) => [cell.id, cell]));
  const outputs = new Map<string, KeptOutput>();
  const plans = new Map<string, SimulationPlan>();
  const cancelled = () => options.isCancelled?.() ?? false;

  const keptCurrent = (cellId: string): KeptOutput | undefined => {
    const kept = options.kept?.(cellId);
    return kept && kept.fingerprint === fingerprints[cellId] ? kept : undefined;
  };
  const context = (step: RunStep): RunStepContext => ({
    doc,
    executor: options.executor,
    forced: step.force,
    plan(simulationId) {
      let plan = plans.get(simulationId);
      if (!plan) {
        plan = buildSimulationPlan(doc, simulationId);
        plans.set(simulationId, plan);
      }
      return plan;
    },
    pointPlan: (simulationId, point) => buildSimulationPlan(doc, simulationId, point),
    varyingParameters: (simulationId, points) => varyingParameters(doc, simulationId, points),
    isCancelled: cancelled,
    currentOutput: (cellId) => outputs.get(cellId)?.output ?? keptCurrent(cellId)?.output,
    datasets: options.datasets,
    onProgress: (progress) => options.onProgress?.(step.cellId, progress),
  });

  for (const step of steps) {
    if (cancelled()) return { outputs, cancelled: true, engineVersion: ENGINE_VERSION };
    const cell = byId.get(step.cellId)!;
    const runStep = kindOf(cell).run!;
    const stepContext = context(step);
    options.onStepStart?.(step);
    const fingerprint = fingerprints[step.cellId] ?? '';
    let output: CellOutput;
    try {
      const kept = step.force ? undefined : keptCurrent(step.cellId);
      if (kept && (runStep.stillCurrent?.(cell, kept.output, stepContext) ?? true)) {
        outputs.set(step.cellId, kept);
        continue;
      }
      output = await runStep.execute(cell, stepContext);
    } catch (error) {
      if (isCancellation(error) || cancelled()) {
        return { outputs, cancelled: true, engineVersion: ENGINE_VERSION };
      }
      output = { kind: 'error', message: describeRunError(error, doc), finishedAt: new Date() };
    }
    const result = { output, fingerprint };
    outputs.set(step.cellId, result);
    options.onCellOutput?.(step.cellId, result);
  }
  return { outputs, cancelled: cancelled(), engineVersion: ENGINE_VERSION };
}

/**
 * Runs every computing cell and gives the plain JSON the command-line runner prints, cells in
 * sheet order. A cancel rejects with RunCancelledError.
 */
export async function runSheetToJson(
  doc: SheetDocument,
  executor: RunExecutor,
  options: Omit<RunSheetOptions, 'executor' | 'target'> = {},
): Promise<SheetRunJson> {
  const run = await runSheet(doc, { ...options, executor });
  if (run.cancelled) throw new RunCancelledError();
  const cells = doc.cells.flatMap((cell) => {
    const kept = run.outputs.get(cell.id);
    return kept ? [cellOutputJson(cell.id, cell.kind, kept.output)] : [];
  });
  return { title: doc.title, engineVersion: run.engineVersion, cells };
}

/**
 * Digests of the simulation outputs that match the document as it is now, and their final mean
 * and variance per state (over the paths not lost), for saving a version: a later rerun compares
 * digests bit for bit, or, under another engine version, the moments within their errors.
 */
export function currentRunRecords(
  doc: SheetDocument,
  kept: (cellId: string) => KeptOutput | undefined,
  fingerprints: Readonly<Record<string, string>>,
): { digests: Record<string, string>; moments: VersionMoments } {
  const digests: Record<string, string> = {};
  const moments: VersionMoments = {};
  for (const cell of doc.cells) {
    const output = kept(cell.id);
    if (cell.kind !== 'simulation' || output?.output.kind !== 'simulation') continue;
    if (output.fingerprint !== fingerprints[cell.id]) continue;
    digests[cell.id] = output.output.result.digest;
    const json = cellOutputJson(cell.id, cell.kind, output.output);
    if ('digest' in json) {
      const record = simulationRecord(json);
      moments[cell.id] = { paths: record.paths ?? 0, final: record.final ?? {} };
    }
  }
  return { digests, moments };
}
