import { z } from 'zod';
import { evaluateProbe } from '../engine/probes';
import type { ProbeRequest } from '../engine/result';
import { checkReader } from '../sheet/check-readers';
import type { ProbeCell } from '../sheet/document';
import type { CellKindDefinition } from './kind';
import { cellIdSchema, finite, symbolNameSchema } from './fields';
import { firstStateOf, nearestCell, needsSimulation } from './helpers';
import { stateIndex } from './state-index';

export const probeQuantitySchema = z.enum([
  'mean',
  'variance',
  'quantile',
  'exceedance', // P(X_t ≥ level)
  'subceedance', // P(X_t ≤ level)
  'hit-before', // P(path reaches level before t1)
  'first-passage', // first-passage time summary among paths that reach level
  'extinction', // P(path absorbed at its lower boundary, or ≤ level, by t1)
  'covariance', // Cov(X_t, Y_t) of `state` and `stateY`
  'correlation', // Corr(X_t, Y_t) of `state` and `stateY`
]);
export type ProbeQuantity = z.infer<typeof probeQuantitySchema>;

/** A statistic read from a simulation's paths, with its standard error and 95 % interval. */
export const probeCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('probe'),
  simulation: cellIdSchema,
  quantity: probeQuantitySchema,
  state: symbolNameSchema,
  /** The second state variable of a covariance or correlation. */
  stateY: symbolNameSchema.optional(),
  /** Time the quantity is read at; default t1. */
  time: finite.optional(),
  level: finite.optional(),
  /** Probability for quantiles, in (0, 1). */
  probability: z.number().gt(0).lt(1).optional(),
  /** Which side the level is approached from for hit-before and first-passage; default 'above'. */
  direction: z.enum(['above', 'below']).optional(),
  /**
   * hit-before and first-passage: 'discrete' (absent = discrete) checks the level at the steps
   * only; 'bgk' applies the Broadie–Glasserman–Kou continuity correction (needs the state's
   * diffusion to depend on that state alone). Optional, so older documents stay valid.
   */
  monitoring: z.enum(['discrete', 'bgk']).optional(),
});

const PROBE_WORDS: Record<ProbeQuantity, string> = {
  mean: 'mean',
  variance: 'variance',
  quantile: 'quantile',
  exceedance: 'P(≥ level)',
  subceedance: 'P(≤ level)',
  'hit-before': 'P(reach level)',
  'first-passage': 'first-passage time',
  extinction: 'extinction probability',
  covariance: 'covariance',
  correlation: 'correlation',
};

/** The engine's view of a probe cell: states by index rather than by name. */
export function probeRequest(cell: ProbeCell, stateNames: readonly string[]): ProbeRequest {
  const request: ProbeRequest = {
    quantity: cell.quantity,
    state: stateIndex(stateNames, cell.state, 'probe'),
  };
  if (cell.stateY !== undefined) request.stateY = stateIndex(stateNames, cell.stateY, 'probe');
  if (cell.time !== undefined) request.time = cell.time;
  if (cell.level !== undefined) request.level = cell.level;
  if (cell.probability !== undefined) request.probability = cell.probability;
  if (cell.direction !== undefined) request.direction = cell.direction;
  if (cell.monitoring !== undefined) request.monitoring = cell.monitoring;
  return request;
}

/** The side a probe's level is watched from, or null for quantities read at a time only. */
function watchDirection(cell: ProbeCell): 'above' | 'below' | null {
  if (cell.quantity === 'hit-before' || cell.quantity === 'first-passage') return cell.direction ?? 'above';
  if (cell.quantity === 'extinction') return 'below';
  return null;
}

export const probeKind: CellKindDefinition<'probe'> = {
  kind: 'probe',
  label: 'Probe',
  word: 'probe',
  colour: 'plum',
  cannotAdd: needsSimulation,
  create({ id, doc, index }) {
    const simulation = nearestCell(doc, 'simulation', index);
    return {
      id,
      kind: 'probe',
      simulation: simulation?.id ?? 'simulation',
      quantity: 'mean',
      state: firstStateOf(doc, simulation),
    };
  },
  title: (cell) =>
    cell.stateY !== undefined && (cell.quantity === 'covariance' || cell.quantity === 'correlation')
      ? `${PROBE_WORDS[cell.quantity]} of ${cell.state} and ${cell.stateY}`
      : `${PROBE_WORDS[cell.quantity]} of ${cell.state}`,
  reads: (cell) => [cell.simulation],
  check: (cell, { index }) => checkReader(index, cell),
  asksOf(cell, simulation, model) {
    if (cell.simulation !== simulation.id) return null;
    const times = cell.time === undefined ? [] : [cell.time];
    const direction = watchDirection(cell);
    if (cell.level === undefined || direction === null) return { times, watches: [] };
    const state = model.states.findIndex((s) => s.name === cell.state);
    const crossing = cell.quantity === 'hit-before' || cell.quantity === 'first-passage';
    const correction = crossing && cell.monitoring === 'bgk' ? 'bgk' : 'none';
    return { times, watches: [{ state, level: cell.level, direction, correction }] };
  },
  run: {
    rank: 1,
    needs: (cell) => [cell.simulation],
    async execute(cell, context) {
      const source = context.currentOutput(cell.simulation);
      if (source?.kind !== 'simulation') {
        const reason =
          source?.kind === 'error'
            ? `its simulation failed: ${source.message}`
            : 'its simulation has no result';
        throw new Error(`cannot read this probe: ${reason}`);
      }
      const estimate = evaluateProbe(source.result, probeRequest(cell, source.plan.model.stateNames));
      return { kind: 'probe', estimate, finishedAt: new Date() };
    },
  },
};
