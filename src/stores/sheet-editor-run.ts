import type { Cell, ProbeCell, SheetDocument, StudyCell } from '@shared/sheet/document';
import type { SimulationPlan } from '@shared/engine/plan';
import type {
  ProbeEstimate,
  ProbeRequest,
  SimulationResult,
  StudyOptions,
  StudyResult,
} from '@shared/engine/result';
import type { CellOutput } from '@/components/cells/contract';
import { stableStringify, transitiveDependencies } from './sheet-editor-fingerprint';

/**
 * What "Run all" and "Run cell" do, without Vue: which numerical cells to run in which order, and
 * running them one by one through a backend (the worker pool in the browser, a fake in tests).
 * Simulations and studies run in workers; probes are read from a simulation's result here, which
 * is cheap and needs no generated code.
 */

export interface RunProgress {
  pathsDone: number;
  paths: number;
  elapsedMs: number;
  /** Estimated time left, null until the first paths are done. */
  etaMs: number | null;
}

export interface SheetRunBackend {
  runSimulation(plan: SimulationPlan, onProgress: (progress: RunProgress) => void): Promise<SimulationResult>;
  runStudy(
    plan: SimulationPlan,
    options: StudyOptions,
    onProgress: (progress: RunProgress) => void,
  ): Promise<StudyResult>;
  cancel(): void;
}

/** The pure pieces of shared/ a run needs, passed in so the order logic stays testable. */
export interface RunTools {
  buildSimulationPlan(doc: SheetDocument, simulationCellId: string): SimulationPlan;
  evaluateProbe(result: SimulationResult, probe: ProbeRequest): ProbeEstimate;
}

export type RunStepKind = 'simulation' | 'probe' | 'study';

export interface RunStep {
  cellId: string;
  kind: RunStepKind;
  /** Run even when an up-to-date output exists (the cells the person asked for). */
  force: boolean;
}

const NUMERICAL: ReadonlySet<Cell['kind']> = new Set(['simulation', 'probe', 'study']);

/**
 * The steps of a run in dependency order: simulations first (in sheet order), then the probes and
 * studies. `targetId` null means every numerical cell; otherwise the target and what it needs (a
 * probe or chart needs its simulation), or, for a params or model cell, every numerical cell that
 * reads it.
 */
export function planRunSteps(
  doc: SheetDocument,
  targetId: string | null,
  dependencies: ReadonlyMap<string, readonly string[]>,
): RunStep[] {
  const wanted = new Map<string, boolean>();
  const want = (id: string, force: boolean): void => {
    wanted.set(id, force || (wanted.get(id) ?? false));
  };
  const byId = new Map(doc.cells.map((cell) => [cell.id, cell]));
  if (targetId === null) {
    for (const cell of doc.cells) if (NUMERICAL.has(cell.kind)) want(cell.id, true);
  } else {
    const target = byId.get(targetId);
    if (!target) return [];
    if (target.kind === 'params' || target.kind === 'model') {
      for (const cell of doc.cells) {
        if (NUMERICAL.has(cell.kind) && transitiveDependencies(cell.id, dependencies).includes(targetId))
          want(cell.id, true);
      }
    } else if (target.kind === 'chart') {
      want(target.simulation, true);
    } else if (NUMERICAL.has(target.kind)) {
      want(target.id, true);
    }
  }
  // A probe reads a simulation's result: run that simulation too, when its output is not current.
  for (const id of [...wanted.keys()]) {
    const cell = byId.get(id);
    if (cell?.kind === 'probe') want(cell.simulation, false);
  }
  const rank = (kind: Cell['kind']): number => (kind === 'simulation' ? 0 : 1);
  return doc.cells
    .filter((cell) => wanted.has(cell.id) && NUMERICAL.has(cell.kind))
    .sort((a, b) => rank(a.kind) - rank(b.kind))
    .map((cell) => ({
      cellId: cell.id,
      kind: cell.kind as RunStepKind,
      force: wanted.get(cell.id) ?? false,
    }));
}

export interface RunContext {
  doc: SheetDocument;
  /** Current fingerprints of the document's cells. */
  fingerprints: Readonly<Record<string, string>>;
  backend: SheetRunBackend;
  tools: RunTools;
  outputOf(cellId: string): { output: CellOutput; fingerprint: string } | undefined;
  setOutput(cellId: string, output: CellOutput, fingerprint: string): void;
  onStepStart(step: RunStep): void;
  onProgress(cellId: string, progress: RunProgress): void;
  isCancelled(): boolean;
}

/** A thrown value in plain words for the cell that caused it. */
export function describeRunError(error: unknown): string {
  if (error instanceof Error && error.message) return error.message;
  if (typeof error === 'string' && error) return error;
  return 'the run failed for an unknown reason';
}

function stateIndex(plan: SimulationPlan, state: string | undefined, cellKind: string): number {
  if (state === undefined) return 0;
  const index = plan.model.stateNames.indexOf(state);
  if (index < 0) {
    throw new Error(
      `the ${cellKind} names state '${state}', which the model does not have (it has ${plan.model.stateNames.join(', ')})`,
    );
  }
  return index;
}

export function probeRequest(probe: ProbeCell, plan: SimulationPlan): ProbeRequest {
  return {
    quantity: probe.quantity,
    state: stateIndex(plan, probe.state, 'probe'),
    ...(probe.time !== undefined ? { time: probe.time } : {}),
    ...(probe.level !== undefined ? { level: probe.level } : {}),
    ...(probe.probability !== undefined ? { probability: probe.probability } : {}),
    ...(probe.direction !== undefined ? { direction: probe.direction } : {}),
  };
}

export function studyOptions(study: StudyCell, plan: SimulationPlan): StudyOptions {
  return {
    levels: study.levels,
    coarsestSteps: study.coarsestSteps,
    paths: study.paths,
    state: stateIndex(plan, study.state, 'study'),
    reference: study.reference,
  };
}

/** Whether the simulation's output was computed from exactly the plan the sheet gives now. */
function simulationIsCurrent(ctx: RunContext, simulationId: string, plan: SimulationPlan): boolean {
  const kept = ctx.outputOf(simulationId);
  if (!kept || kept.output.kind !== 'simulation') return false;
  if (kept.fingerprint !== ctx.fingerprints[simulationId]) return false;
  return stableStringify(kept.output.plan) === stableStringify(plan);
}

async function runSimulationStep(ctx: RunContext, step: RunStep): Promise<void> {
  const plan = ctx.tools.buildSimulationPlan(ctx.doc, step.cellId);
  if (!step.force && simulationIsCurrent(ctx, step.cellId, plan)) return;
  const started = performance.now();
  const result = await ctx.backend.runSimulation(plan, (progress) => ctx.onProgress(step.cellId, progress));
  ctx.setOutput(
    step.cellId,
    {
      kind: 'simulation',
      plan,
      result,
      finishedAt: new Date(),
      seconds: (performance.now() - started) / 1000,
    },
    ctx.fingerprints[step.cellId] ?? '',
  );
}

function runProbeStep(ctx: RunContext, probe: ProbeCell): void {
  const kept = ctx.outputOf(probe.simulation);
  if (!kept || kept.output.kind !== 'simulation') {
    const reason =
      kept?.output.kind === 'error'
        ? `its simulation failed: ${kept.output.message}`
        : 'its simulation has no result';
    throw new Error(`cannot read this probe: ${reason}`);
  }
  const estimate = ctx.tools.evaluateProbe(kept.output.result, probeRequest(probe, kept.output.plan));
  ctx.setOutput(
    probe.id,
    { kind: 'probe', estimate, finishedAt: new Date() },
    ctx.fingerprints[probe.id] ?? '',
  );
}

async function runStudyStep(ctx: RunContext, study: StudyCell): Promise<void> {
  const plan = ctx.tools.buildSimulationPlan(ctx.doc, study.simulation);
  const options = studyOptions(study, plan);
  const started = performance.now();
  const result = await ctx.backend.runStudy(plan, options, (progress) => ctx.onProgress(study.id, progress));
  ctx.setOutput(
    study.id,
    { kind: 'study', plan, result, finishedAt: new Date(), seconds: (performance.now() - started) / 1000 },
    ctx.fingerprints[study.id] ?? '',
  );
}

/**
 * Runs the steps in order. A failing step leaves an error output on its own cell and the run goes
 * on with the next step (a probe of a failed simulation then says so). Returns false when
 * cancelled; outputs of steps already finished are kept.
 */
export async function executeRunSteps(steps: readonly RunStep[], ctx: RunContext): Promise<boolean> {
  const byId = new Map(ctx.doc.cells.map((cell) => [cell.id, cell]));
  for (const step of steps) {
    if (ctx.isCancelled()) return false;
    const cell = byId.get(step.cellId);
    if (!cell) continue;
    ctx.onStepStart(step);
    try {
      if (cell.kind === 'simulation') await runSimulationStep(ctx, step);
      else if (cell.kind === 'probe') runProbeStep(ctx, cell);
      else if (cell.kind === 'study') await runStudyStep(ctx, cell);
    } catch (error) {
      if (ctx.isCancelled()) return false;
      ctx.setOutput(
        step.cellId,
        { kind: 'error', message: describeRunError(error), finishedAt: new Date() },
        ctx.fingerprints[step.cellId] ?? '',
      );
    }
  }
  return !ctx.isCancelled();
}

/** Digests of the simulation outputs that match the document as it is now, for saving a version. */
export function currentDigests(
  doc: SheetDocument,
  outputs: Readonly<Record<string, CellOutput | undefined>>,
  outputFingerprints: Readonly<Record<string, string>>,
  fingerprints: Readonly<Record<string, string>>,
): Record<string, string> {
  const digests: Record<string, string> = {};
  for (const cell of doc.cells) {
    const output = outputs[cell.id];
    if (cell.kind !== 'simulation' || output?.kind !== 'simulation') continue;
    if (outputFingerprints[cell.id] !== fingerprints[cell.id]) continue;
    digests[cell.id] = output.result.digest;
  }
  return digests;
}
