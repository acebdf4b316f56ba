import { z } from 'zod';
import { MAX_PATHS } from '../engine/limits';
import type { ScenariosCell } from '../sheet/document';
import type { CellKindDefinition } from './kind';
import { cellIdSchema, finite } from './fields';
import { nearestCell, needsSimulation } from './helpers';
import { checkManyPoints, checkOverrideNames } from './many-points';
import { runScenarios } from './scenarios-run';

export const MAX_SCENARIOS = 12;

export const scenarioSchema = z.object({
  name: z
    .string()
    .trim()
    .min(1, 'a scenario needs a name')
    .max(60, 'a scenario name is at most 60 characters'),
  /** Parameter values that replace the simulation's for this scenario. */
  overrides: z.record(z.string(), finite).default({}),
});
export type Scenario = z.infer<typeof scenarioSchema>;

/** Named sets of parameter overrides of one simulation, compared with a baseline on common random numbers. */
export const scenariosCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('scenarios'),
  simulation: cellIdSchema,
  /** Probe cells (reading that simulation) reported per scenario. */
  probes: z.array(cellIdSchema).max(8, 'a scenarios cell reports at most 8 probes').default([]),
  scenarios: z
    .array(scenarioSchema)
    .min(1, 'add a scenario')
    .max(MAX_SCENARIOS, `at most ${MAX_SCENARIOS} scenarios`),
  /** The name of the scenario the others are compared with. */
  baseline: z.string(),
  /** Independent random streams per scenario instead of common random numbers. */
  independent: z.boolean().default(false),
  /** Paths per scenario; the simulation's own when absent. */
  paths: z.number().int().min(10).max(MAX_PATHS).optional(),
});

export const scenariosKind: CellKindDefinition<'scenarios'> = {
  kind: 'scenarios',
  label: 'Scenarios',
  word: 'scenarios',
  colour: 'indigo',
  cannotAdd: needsSimulation,
  create({ id, doc, index }) {
    const simulation = nearestCell(doc, 'simulation', index);
    const simulationId = simulation?.id ?? 'simulation';
    const probes = doc.cells.flatMap((cell) =>
      cell.kind === 'probe' && cell.simulation === simulationId ? [cell.id] : [],
    );
    return {
      id,
      kind: 'scenarios',
      simulation: simulationId,
      probes,
      scenarios: [{ name: 'baseline', overrides: {} }],
      baseline: 'baseline',
      independent: false,
    };
  },
  title: (cell: ScenariosCell) =>
    `${cell.scenarios.length} ${cell.scenarios.length === 1 ? 'scenario' : 'scenarios'} against “${cell.baseline}”`,
  reads: (cell) => [cell.simulation, ...cell.probes],
  check(cell, { index }) {
    const issues = checkManyPoints(index, cell.id, cell.probes, cell.simulation, ['probes'], true);
    const simulation = index.cellsById.get(cell.simulation);
    if (simulation?.kind !== 'simulation')
      issues.push({
        cellId: cell.id,
        path: ['simulation'],
        message: `there is no simulation cell '${cell.simulation}'`,
      });
    const seen = new Set<string>();
    cell.scenarios.forEach((scenario, k) => {
      if (seen.has(scenario.name))
        issues.push({
          cellId: cell.id,
          path: ['scenarios', k, 'name'],
          message: `two scenarios are named “${scenario.name}”`,
        });
      seen.add(scenario.name);
      issues.push(...checkOverrideNames(index, cell.id, scenario.overrides, ['scenarios', k, 'overrides']));
    });
    if (!seen.has(cell.baseline))
      issues.push({
        cellId: cell.id,
        path: ['baseline'],
        message: `the baseline “${cell.baseline}” is not one of the scenarios`,
      });
    return issues;
  },
  run: {
    rank: 1,
    execute: (cell, context) => runScenarios(cell, context),
  },
};
