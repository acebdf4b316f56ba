import { describe, expect, it } from 'vitest';
import { parseDatasetText } from '@shared/data/parse-table';
import { memoryDatasetProvider } from '@shared/data/provider';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet } from '@shared/run/run-sheet';
import { checkSheet, sheetDocumentSchema, type SheetDocument } from '@shared/sheet';

/** Invented: nitrate in a drainage ditch at two farms, with one missing reading. */
const CSV = 'day,farm,nitrate\n0,east,4.1\n2,east,\n4,east,3.2\n0,west,6.0\n3,west,5.1\n';
const CHECKSUM = 'a'.repeat(64);

function sheet(change: Record<string, unknown> = {}): SheetDocument {
  return sheetDocumentSchema.parse({
    schemaVersion: 1,
    title: 'Ditch nitrate',
    cells: [
      { id: 'p', kind: 'params', params: [{ name: 'k', value: 0.3 }] },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'N', initial: '5', drift: '-k * N', diffusion: { W: '0.1' } }],
        noises: [{ name: 'W' }],
      },
      {
        id: 'obs',
        kind: 'data',
        dataset: { id: 'ds1', checksum: CHECKSUM, name: 'ditch' },
        model: 'm',
        timeColumn: 'day',
        groupColumn: 'farm',
        columns: [{ column: 'nitrate', state: 'N', unit: 'mg/L' }],
        ...change,
      },
    ],
  });
}

function provider(checksum = CHECKSUM) {
  const parsed = parseDatasetText(CSV, { timeColumn: 'day', groupColumn: 'farm' });
  if (!parsed.ok) throw new Error('fixture does not parse');
  return memoryDatasetProvider(new Map([['ds1', { ...parsed.table, checksum }]]));
}

describe('the data cell', () => {
  it('splits the rows into one series per group, with null for a missing value', async () => {
    const run = await runSheet(sheet(), { executor: inProcessExecutor(), datasets: provider() });
    const output = run.outputs.get('obs')?.output;
    expect(output?.kind).toBe('data');
    if (output?.kind !== 'data') return;
    expect(output.observed.columns).toEqual([{ column: 'nitrate', state: 'N', unit: 'mg/L' }]);
    expect(output.observed.series).toEqual([
      { group: 'east', times: [0, 2, 4], values: { N: [4.1, null, 3.2] } },
      { group: 'west', times: [0, 3], values: { N: [6.0, 5.1] } },
    ]);
  });

  it('refuses a stored dataset whose checksum differs from the one the cell was made with', async () => {
    const run = await runSheet(sheet(), {
      executor: inProcessExecutor(),
      datasets: provider('b'.repeat(64)),
    });
    const output = run.outputs.get('obs')?.output;
    expect(output?.kind === 'error' && output.message).toMatch(/does not match this cell \(checksum bbbb/);
  });

  it('says which column is missing when the mapping names one the file does not have', async () => {
    const doc = sheet({ columns: [{ column: 'phosphate', state: 'N', unit: '' }] });
    const run = await runSheet(doc, { executor: inProcessExecutor(), datasets: provider() });
    const output = run.outputs.get('obs')?.output;
    expect(output?.kind === 'error' && output.message).toMatch(/no column 'phosphate' for the state N/);
  });

  it('reports a time out of order when the group column is left out', async () => {
    const doc = sheet({ groupColumn: undefined });
    const run = await runSheet(doc, { executor: inProcessExecutor(), datasets: provider() });
    const output = run.outputs.get('obs')?.output;
    expect(output?.kind === 'error' && output.message).toMatch(/row 5: time 0 does not come after 4/);
  });

  it('flags a mapped state the model does not have, at the path of that field', () => {
    const issues = checkSheet(sheet({ columns: [{ column: 'nitrate', state: 'P', unit: '' }] }));
    expect(issues).toEqual([
      expect.objectContaining({
        cellId: 'obs',
        path: ['columns', 0, 'state'],
        message: expect.stringMatching(/'P' is not a state/),
      }),
    ]);
  });

  it('asks for a file before it can run', async () => {
    const run = await runSheet(sheet({ dataset: null }), {
      executor: inProcessExecutor(),
      datasets: provider(),
    });
    const output = run.outputs.get('obs')?.output;
    expect(output?.kind === 'error' && output.message).toMatch(/no file yet/);
  });
});
