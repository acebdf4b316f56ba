import { z } from 'zod';
import { MAX_PATHS, MAX_STEPS } from '../engine/limits';
import { ENGINE_VERSION } from '../engine/version';
import { checkSimulation } from '../sheet/check-simulation';
import { stableStringify } from '../sheet/stable-json';
import type { CellKindDefinition } from './kind';
import { cellIdSchema, cellNameSchema, finite } from './fields';
import { nearestCell, secondsSince } from './helpers';

export const methodSchema = z.enum(['euler-maruyama', 'milstein', 'heun']);
export type Method = z.infer<typeof methodSchema>;

export const boundaryRuleSchema = z.discriminatedUnion('rule', [
  z.object({ rule: z.literal('none') }),
  z.object({ rule: z.literal('absorb'), level: finite, side: z.enum(['below', 'above']).default('below') }),
  z.object({ rule: z.literal('reflect'), level: finite, side: z.enum(['below', 'above']).default('below') }),
]);
export type BoundaryRule = z.infer<typeof boundaryRuleSchema>;

/** Many paths of one model: scheme, time grid, seed, boundaries and parameter overrides. */
export const simulationCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('simulation'),
  name: cellNameSchema.optional(),
  /** Id of the model cell to simulate. */
  model: cellIdSchema,
  method: methodSchema.default('euler-maruyama'),
  t0: finite.default(0),
  t1: finite,
  /** Exactly one of steps and stepSize; a step size must resolve to at most MAX_STEPS steps. */
  steps: z.number().int().min(1).max(MAX_STEPS).optional(),
  stepSize: z.number().positive().optional(),
  paths: z.number().int().min(1).max(MAX_PATHS),
  seed: z.number().int().min(0).max(0xffffffff),
  /** Number of saved times on an even grid from t0 to t1 (both included). */
  saveCount: z.number().int().min(2).max(10_001).default(101),
  /** How many whole paths to keep for display. */
  samplePaths: z.number().int().min(0).max(1000).default(20),
  /** Per state variable; missing means none. */
  boundaries: z.record(z.string(), boundaryRuleSchema).default({}),
  /** A path whose state leaves [-bound, bound] is stopped and counted as a blow-up. */
  blowupBound: z.number().positive().optional(),
  /** Parameter values that replace the sheet's for this run. */
  overrides: z.record(z.string(), finite).default({}),
});

export const simulationKind: CellKindDefinition<'simulation'> = {
  kind: 'simulation',
  label: 'Simulation',
  word: 'simulation',
  colour: 'blue',
  cannotAdd: (doc, index) => (nearestCell(doc, 'model', index) ? null : 'add a model first'),
  create: ({ id, doc, index }) => ({
    id,
    kind: 'simulation',
    model: nearestCell(doc, 'model', index)?.id ?? 'model',
    method: 'euler-maruyama',
    t0: 0,
    t1: 10,
    steps: 1000,
    paths: 1000,
    seed: Math.floor(Math.random() * 0xffffffff),
    saveCount: 101,
    samplePaths: 20,
    boundaries: {},
    overrides: {},
  }),
  title: (cell) => cell.name ?? `${cell.paths} paths, t from ${cell.t0} to ${cell.t1}`,
  reads: (cell, { paramsCellIds }) => [cell.model, ...paramsCellIds],
  check: (cell, { index }) => checkSimulation(index, cell),
  run: {
    rank: 0,
    /**
     * A kept result is current only if it came from exactly today's plan: a probe added since may
     * watch a new level or time, which the cell's own fingerprint does not cover.
     */
    stillCurrent: (cell, output, context) =>
      output.kind === 'simulation' && stableStringify(output.plan) === stableStringify(context.plan(cell.id)),
    async execute(cell, context) {
      const plan = context.plan(cell.id);
      const started = performance.now();
      const result = await context.executor.runSimulation(plan, context.onProgress);
      return {
        kind: 'simulation',
        plan,
        result,
        engineVersion: ENGINE_VERSION,
        finishedAt: new Date(),
        seconds: secondsSince(started),
      };
    },
  },
};
