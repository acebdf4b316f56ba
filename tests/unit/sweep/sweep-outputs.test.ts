import { describe, expect, it } from 'vitest';
import { inProcessExecutor } from '@shared/run/environments';
import { resultFiles } from '@shared/run/results-csv';
import { runSheet, runSheetToJson } from '@shared/run/run-sheet';
import { scaleSheetPaths } from '@shared/run/scale';
import type { SweepJson } from '@shared/run/sweep-result';
import { checkSheet } from '@shared/sheet';
import { sheet } from './sheets';

/** A two-parameter grid of a mean-reverting level: ordering, tables, CSV files and scaling. */
const doc = sheet({
  params: { theta: 1, sigma: 0.5 },
  drift: '-theta * X',
  diffusion: 'sigma',
  initial: '1',
  t1: 1,
  steps: 10,
  paths: 200,
  probes: [{ id: 'level', quantity: 'mean' }],
  cells: [
    {
      id: 'grid',
      kind: 'sweep',
      probe: 'level',
      axes: [
        { parameter: 'theta', spacing: 'log', from: 0.5, to: 2, count: 3, values: [] },
        { parameter: 'sigma', spacing: 'list', from: 0, to: 0, count: 1, values: [0.1, 0.9] },
      ],
      paths: 300,
    },
  ],
});

describe('sweep outputs', () => {
  it('runs a grid with the first parameter slowest and prints its table in the runner’s JSON', async () => {
    const output = await runSheetToJson(doc, inProcessExecutor());
    const grid = output.cells.find((cell) => cell.id === 'grid') as SweepJson;
    expect(grid.parameters).toEqual(['theta', 'sigma']);
    expect(grid.table.map((row) => [row.theta, row.sigma])).toEqual([
      [0.5, 0.1],
      [0.5, 0.9],
      [1, 0.1],
      [1, 0.9],
      [2, 0.1],
      [2, 0.9],
    ]);
    expect(grid.table.every((row) => row.paths === 300)).toBe(true);
    expect(grid.target).toBeNull();
  });

  it('writes the sweep’s table as a CSV file of the sheet’s results', async () => {
    const run = await runSheet(doc, { executor: inProcessExecutor() });
    const files = resultFiles(doc, (id) => run.outputs.get(id)?.output);
    const file = files.find((f) => f.fileName === 'sweep-grid.csv')!;
    expect(file.csv.split('\r\n')[0]).toBe('theta,sigma,estimate,standardError,ciLow,ciHigh,paths,digest');
    expect(file.csv.trim().split('\r\n')).toHaveLength(7);
  });

  it('scales a sweep’s own paths with the sheet', () => {
    const scaled = scaleSheetPaths(doc, 0.5);
    const grid = scaled.cells.find((cell) => cell.id === 'grid');
    expect(grid?.kind === 'sweep' && grid.paths).toBe(150);
  });

  it('checks a target on a grid and two axes of one parameter', () => {
    const bad = {
      ...doc,
      cells: doc.cells.map((cell) =>
        cell.kind === 'sweep'
          ? {
              ...cell,
              axes: [cell.axes[0]!, { ...cell.axes[1]!, parameter: 'theta' }],
              target: { value: 1, refineRuns: 2 },
            }
          : cell,
      ),
    };
    const messages = checkSheet(bad)
      .filter((issue) => issue.cellId === 'grid')
      .map((issue) => issue.message);
    expect(messages).toContain('the two swept parameters must differ');
    expect(messages).toContain('a target search needs a sweep of one parameter');
  });
});
