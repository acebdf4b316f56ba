import { buildSimulationPlan } from '../sheet/index';
import type { Cell, SheetDocument } from '../sheet/document';
import { evaluateProbe } from '../engine/probes';
import type { SimulationPlan } from '../engine/plan';
import type { SimulationResult, StudyOptions, StudyResult } from '../engine/result';
import type { RunProgress } from './chunk-pool';
import {
  probeOutput,
  probeRequest,
  simulationOutput,
  studyOptions,
  studyOutput,
  type CellOutput,
  type SheetRunOutput,
} from './outputs';

/**
 * Runs every numerical cell of a sheet (simulation, probe, study) and assembles their outputs.
 * Where the numbers are computed is the caller's business: the browser passes its worker pool,
 * the command-line runner passes worker_threads, tests may run in-process. A probe needs its
 * simulation's result, so simulations run on first demand and at most once each; the outputs
 * come back in document order.
 */
export interface SheetRunEnvironment {
  runSimulation(
    plan: SimulationPlan,
    onProgress?: (progress: RunProgress) => void,
  ): Promise<SimulationResult>;
  runStudy(plan: SimulationPlan, options: StudyOptions): Promise<StudyResult>;
}

export interface RunSheetHooks {
  /** Progress of the simulation or study cell being computed. */
  onProgress?(cellId: string, progress: RunProgress): void;
  /** Each cell's output as soon as it is ready. */
  onCellOutput?(output: CellOutput): void;
  /** The full result of a simulation, for charts. */
  onSimulationResult?(cellId: string, result: SimulationResult, plan: SimulationPlan): void;
}

export type NumericalCell = Extract<Cell, { kind: 'simulation' | 'probe' | 'study' }>;

export function isNumericalCell(cell: Cell): cell is NumericalCell {
  return cell.kind === 'simulation' || cell.kind === 'probe' || cell.kind === 'study';
}

/** True for a user's cancel, which stops the whole run instead of failing one cell. */
export function isCancellation(error: unknown): boolean {
  return error instanceof Error && error.name === 'RunCancelledError';
}

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

export async function runSheet(
  doc: SheetDocument,
  env: SheetRunEnvironment,
  hooks: RunSheetHooks = {},
): Promise<SheetRunOutput> {
  const plans = new Map<string, SimulationPlan>();
  const simulations = new Map<string, Promise<SimulationResult>>();

  const planFor = (simulationId: string): SimulationPlan => {
    let plan = plans.get(simulationId);
    if (!plan) {
      plan = buildSimulationPlan(doc, simulationId);
      plans.set(simulationId, plan);
    }
    return plan;
  };

  const resultFor = (simulationId: string): Promise<SimulationResult> => {
    let pending = simulations.get(simulationId);
    if (!pending) {
      pending = (async () => {
        const plan = planFor(simulationId);
        const result = await env.runSimulation(plan, (progress) =>
          hooks.onProgress?.(simulationId, progress),
        );
        hooks.onSimulationResult?.(simulationId, result, plan);
        return result;
      })();
      simulations.set(simulationId, pending);
    }
    return pending;
  };

  const computeCell = async (cell: NumericalCell): Promise<CellOutput> => {
    switch (cell.kind) {
      case 'simulation':
        return simulationOutput(cell.id, await resultFor(cell.id));
      case 'probe': {
        const result = await resultFor(cell.simulation);
        return probeOutput(cell.id, evaluateProbe(result, probeRequest(cell, result.stateNames)));
      }
      case 'study': {
        const plan = planFor(cell.simulation);
        return studyOutput(cell.id, await env.runStudy(plan, studyOptions(cell, plan.model.stateNames)));
      }
    }
  };

  const cells: CellOutput[] = [];
  for (const cell of doc.cells) {
    if (!isNumericalCell(cell)) continue;
    let output: CellOutput;
    try {
      output = await computeCell(cell);
    } catch (error) {
      if (isCancellation(error)) throw error;
      output = { id: cell.id, kind: cell.kind, error: messageOf(error) };
    }
    cells.push(output);
    hooks.onCellOutput?.(output);
  }
  return { title: doc.title, cells };
}
