import { z } from 'zod';
import { MAX_PATHS, MAX_STEPS } from '../engine/limits';

export { MAX_PATHS, MAX_STEPS };

/**
 * The sheet document: what a version stores (jsonb) and what client, server, runner and engine
 * all read. One schema, validated on both sides. `schemaVersion` lets old versions stay readable
 * once the format grows: a reader upgrades older documents before validating.
 */
export const SHEET_SCHEMA_VERSION = 1;

/** Stable cell ids survive edits, reordering and forks; comments point at them. */
export const cellIdSchema = z
  .string()
  .regex(/^[A-Za-z0-9_-]{1,64}$/, 'a cell id is 1–64 letters, digits, "-" or "_"');

/** A name usable inside expressions: a parameter, a state variable or a noise source. */
export const symbolNameSchema = z
  .string()
  .regex(
    /^[A-Za-z_][A-Za-z0-9_]{0,31}$/,
    'a name starts with a letter or "_" and has only letters, digits and "_"',
  );

/** Text of a restricted expression (checked by the expression compiler, not here). */
export const expressionSchema = z.string().max(2000, 'an expression is at most 2000 characters');

const finite = z.number().refine(Number.isFinite, 'must be a finite number');

export const noteCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('note'),
  text: z.string().max(100_000),
});

export const parameterSchema = z.object({
  name: symbolNameSchema,
  /** A number, or an expression of other parameters (circular definitions are rejected by the checker). */
  value: z.union([finite, expressionSchema]),
  unit: z.string().max(40).optional(),
  min: finite.optional(),
  max: finite.optional(),
  description: z.string().max(500).optional(),
});

export const paramsCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('params'),
  params: z.array(parameterSchema).max(200),
});

export const stateVariableSchema = z.object({
  name: symbolNameSchema,
  /** Initial value: an expression of parameters. */
  initial: expressionSchema,
  unit: z.string().max(40).optional(),
  /** Drift coefficient: an expression of parameters, state variables and t. */
  drift: expressionSchema,
  /** Diffusion coefficient per noise source name; a missing entry means 0. */
  diffusion: z.record(z.string(), expressionSchema),
  /**
   * Optional exact solution X_t, used by step-size studies. In scope: parameters, t, each noise
   * source's name standing for its Brownian motion W_t, and each state name standing for its
   * initial value.
   */
  exact: expressionSchema.optional(),
});

export const noiseSourceSchema = z.object({
  name: symbolNameSchema,
  description: z.string().max(200).optional(),
});

export const modelCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('model'),
  name: z.string().max(80).optional(),
  states: z.array(stateVariableSchema).min(1, 'a model needs at least one state variable').max(16),
  noises: z.array(noiseSourceSchema).max(16),
  /** Correlation matrix of the noise sources (m × m, symmetric, unit diagonal, positive definite). */
  correlation: z.array(z.array(finite)).optional(),
  calculus: z.enum(['ito', 'stratonovich']).default('ito'),
});

export const methodSchema = z.enum(['euler-maruyama', 'milstein', 'heun']);
export type Method = z.infer<typeof methodSchema>;

export const boundaryRuleSchema = z.discriminatedUnion('rule', [
  z.object({ rule: z.literal('none') }),
  z.object({ rule: z.literal('absorb'), level: finite, side: z.enum(['below', 'above']).default('below') }),
  z.object({ rule: z.literal('reflect'), level: finite, side: z.enum(['below', 'above']).default('below') }),
]);
export type BoundaryRule = z.infer<typeof boundaryRuleSchema>;

export const simulationCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('simulation'),
  name: z.string().max(80).optional(),
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

export const probeQuantitySchema = z.enum([
  'mean',
  'variance',
  'quantile',
  'exceedance', // P(X_t ≥ level)
  'subceedance', // P(X_t ≤ level)
  'hit-before', // P(path reaches level before t1)
  'first-passage', // first-passage time summary among paths that reach level
  'extinction', // P(path absorbed at its lower boundary, or ≤ level, by t1)
]);
export type ProbeQuantity = z.infer<typeof probeQuantitySchema>;

export const probeCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('probe'),
  simulation: cellIdSchema,
  quantity: probeQuantitySchema,
  state: symbolNameSchema,
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

export const chartViewSchema = z.enum(['paths', 'fan', 'histogram', 'phase']);

export const chartCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('chart'),
  simulation: cellIdSchema,
  view: chartViewSchema,
  state: symbolNameSchema,
  /** Second state variable for a phase plot. */
  stateY: symbolNameSchema.optional(),
  pathCount: z.number().int().min(1).max(1000).optional(),
  /** Time of a histogram; default t1. */
  time: finite.optional(),
  bins: z.number().int().min(5).max(400).optional(),
  title: z.string().max(120).optional(),
});

export const studyCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('study'),
  simulation: cellIdSchema,
  /** Number of step sizes, each half the one before. */
  levels: z.number().int().min(3).max(12).default(5),
  /** Steps at the coarsest level; the finest has coarsestSteps · 2^(levels−1). */
  coarsestSteps: z.number().int().min(1).max(100_000).default(8),
  paths: z.number().int().min(10).max(1_000_000).default(2000),
  state: symbolNameSchema.optional(),
  reference: z.enum(['auto', 'exact', 'finest']).default('auto'),
});

export const cellSchema = z.discriminatedUnion('kind', [
  noteCellSchema,
  paramsCellSchema,
  modelCellSchema,
  simulationCellSchema,
  chartCellSchema,
  probeCellSchema,
  studyCellSchema,
]);

export const sheetDocumentSchema = z.object({
  schemaVersion: z.literal(SHEET_SCHEMA_VERSION),
  title: z.string().trim().min(1, 'a sheet needs a title').max(200),
  cells: z.array(cellSchema).max(500),
});

export type SheetDocument = z.infer<typeof sheetDocumentSchema>;
export type SheetDocumentInput = z.input<typeof sheetDocumentSchema>;
export type Cell = z.infer<typeof cellSchema>;
export type CellKind = Cell['kind'];
export type NoteCell = z.infer<typeof noteCellSchema>;
export type ParamsCell = z.infer<typeof paramsCellSchema>;
export type Parameter = z.infer<typeof parameterSchema>;
export type ModelCell = z.infer<typeof modelCellSchema>;
export type StateVariable = z.infer<typeof stateVariableSchema>;
export type SimulationCell = z.infer<typeof simulationCellSchema>;
export type ChartCell = z.infer<typeof chartCellSchema>;
export type ProbeCell = z.infer<typeof probeCellSchema>;
export type StudyCell = z.infer<typeof studyCellSchema>;

export function emptySheetDocument(title: string): SheetDocument {
  return { schemaVersion: SHEET_SCHEMA_VERSION, title, cells: [] };
}
