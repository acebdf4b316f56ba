import { z } from 'zod';
import { MAX_PATHS } from '../engine/limits';
import type { SheetDocument, SweepCell } from '../sheet/document';
import type { CellKindDefinition } from './kind';
import { cellIdSchema, finite, symbolNameSchema } from './fields';
import { nearestCell } from './helpers';
import { probeKind } from './probe';
import { checkManyPoints, probeCellOf } from './many-points';
import { runSweep } from './sweep-run';

/** Values on one axis at most, and points on a two-parameter grid at most. */
export const MAX_AXIS_VALUES = 200;
export const MAX_SWEEP_POINTS = 400;

export const sweepAxisSchema = z.object({
  parameter: symbolNameSchema,
  /** 'linear' or 'log': `count` values from `from` to `to`; 'list': the `values` given. */
  spacing: z.enum(['linear', 'log', 'list']),
  from: finite,
  to: finite,
  count: z
    .number()
    .int()
    .min(1, 'a sweep needs at least 1 value')
    .max(MAX_AXIS_VALUES, `a sweep axis has at most ${MAX_AXIS_VALUES} values`),
  values: z.array(finite).max(MAX_AXIS_VALUES, `a list has at most ${MAX_AXIS_VALUES} values`).default([]),
});
export type SweepAxis = z.infer<typeof sweepAxisSchema>;

/** A probe against one parameter (or two on a grid), run with common random numbers, and a target search. */
export const sweepCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('sweep'),
  /** The probe cell whose statistic is swept; its simulation is run at every point. */
  probe: cellIdSchema,
  axes: z
    .array(sweepAxisSchema)
    .min(1, 'a sweep needs a parameter')
    .max(2, 'a sweep has at most two parameters'),
  /** Independent random streams per point instead of common random numbers. */
  independent: z.boolean().default(false),
  /** Paths per point; the simulation's own when absent. */
  paths: z.number().int().min(10).max(MAX_PATHS).optional(),
  /** Find the parameter value where the probe equals `value` (one-parameter sweeps). */
  target: z
    .object({
      value: finite,
      /** Refined runs of the search after the sweep brackets the root. */
      refineRuns: z.number().int().min(0).max(12).default(6),
      /** Paths of each refined run; four times the sweep's when absent. */
      refinePaths: z.number().int().min(10).max(MAX_PATHS).optional(),
    })
    .optional(),
});

/** The values of one axis, in order. */
export function axisValues(axis: SweepAxis): number[] {
  if (axis.spacing === 'list') return [...axis.values];
  if (axis.count === 1) return [axis.from];
  return Array.from({ length: axis.count }, (_, k) => {
    const share = k / (axis.count - 1);
    if (k === axis.count - 1) return axis.to;
    const value =
      axis.spacing === 'log'
        ? axis.from * (axis.to / axis.from) ** share
        : axis.from + (axis.to - axis.from) * share;
    // 12 significant digits: 0.05 rather than 0.049999999999999996 in tables and overrides.
    return Number(value.toPrecision(12));
  });
}

/** Every point of the sweep as overrides, the first axis slowest. */
export function sweepPoints(cell: SweepCell): Record<string, number>[] {
  const [first, second] = cell.axes.map(axisValues);
  const a = cell.axes[0]!.parameter;
  if (second === undefined) return (first ?? []).map((x) => ({ [a]: x }));
  const b = cell.axes[1]!.parameter;
  return (first ?? []).flatMap((x) => second.map((y) => ({ [a]: x, [b]: y })));
}

function checkAxis(
  axis: SweepAxis,
  at: number,
  issue: (path: (string | number)[], message: string) => void,
): void {
  const path = (field: string) => ['axes', at, field];
  if (axis.spacing === 'list') {
    if (axis.values.length === 0) issue(path('values'), 'the list of values is empty');
    return;
  }
  if (axis.count > 1 && axis.from === axis.to)
    issue(path('to'), `“to” equals “from” (${axis.from}): give a range, or a count of 1`);
  if (axis.spacing === 'log' && (axis.from <= 0 || axis.to <= 0))
    issue(path(axis.from <= 0 ? 'from' : 'to'), 'logarithmic spacing needs “from” and “to” above 0');
}

export const sweepKind: CellKindDefinition<'sweep'> = {
  kind: 'sweep',
  label: 'Sweep',
  word: 'sweep',
  colour: 'clay',
  cannotAdd: (doc, index) => (nearestCell(doc, 'probe', index) ? null : 'add a probe first'),
  create({ id, doc, index }) {
    const probe = nearestCell(doc, 'probe', index);
    const params = doc.cells.flatMap((cell) => (cell.kind === 'params' ? cell.params : []));
    const first = params.find((param) => typeof param.value === 'number');
    const value = typeof first?.value === 'number' ? first.value : 1;
    const from = value === 0 ? 0 : value / 2;
    const to = value === 0 ? 1 : value * 2;
    return {
      id,
      kind: 'sweep',
      probe: probe?.id ?? 'probe',
      axes: [
        {
          parameter: first?.name ?? 'k',
          spacing: 'linear',
          from: Math.min(from, to),
          to: Math.max(from, to),
          count: 9,
          values: [],
        },
      ],
      independent: false,
    };
  },
  title(cell) {
    const names = cell.axes.map((axis) => axis.parameter).join(' and ');
    const count = sweepPoints(cell).length;
    return `${names}: ${count} ${count === 1 ? 'value' : 'values'}${cell.target ? `, target ${cell.target.value}` : ''}`;
  },
  reads: (cell, { definedIn }) => [
    cell.probe,
    ...cell.axes.flatMap((axis) => {
      const at = definedIn.get(axis.parameter);
      return at === undefined ? [] : [at];
    }),
  ],
  check(cell, { index }) {
    const issues = checkManyPoints(index, cell.id, cell.probe ? [cell.probe] : [], null, ['probe']);
    const issue = (path: (string | number)[], message: string) =>
      issues.push({ cellId: cell.id, path, message });
    cell.axes.forEach((axis, at) => {
      if (!index.parameters.has(axis.parameter)) {
        const names = [...index.parameters.keys()];
        issue(
          ['axes', at, 'parameter'],
          `there is no parameter '${axis.parameter}'${names.length > 0 ? `; the sheet's parameters are: ${names.join(', ')}` : ''}`,
        );
      }
      checkAxis(axis, at, issue);
    });
    if (cell.axes.length === 2 && cell.axes[0]!.parameter === cell.axes[1]!.parameter)
      issue(['axes', 1, 'parameter'], 'the two swept parameters must differ');
    const points = cell.axes.reduce(
      (product, axis) => product * (axis.spacing === 'list' ? axis.values.length : axis.count),
      1,
    );
    if (points > MAX_SWEEP_POINTS)
      issue(['axes'], `the grid has ${points} points, more than ${MAX_SWEEP_POINTS}: use fewer values`);
    if (cell.target && cell.axes.length !== 1)
      issue(['target'], 'a target search needs a sweep of one parameter');
    return issues;
  },
  run: {
    rank: 1,
    execute: (cell, context) => runSweep(cell, context),
  },
};

/** A short name of the swept probe, for titles and tables. */
export function sweptProbeTitle(cell: SweepCell, doc: SheetDocument): string {
  const probe = probeCellOf(doc, cell.probe);
  return probe ? probeKind.title(probe) : cell.probe;
}
