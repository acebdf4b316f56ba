import { describe, expect, it } from 'vitest';
import { parseDatasetBytes, parseDatasetText, readNumber } from '@shared/data/parse-table';

const bytes = (text: string) => new TextEncoder().encode(text);

describe('reading an uploaded table', () => {
  it('reads numbers, labels and empty cells (missing values), and numbers rows as a spreadsheet does', () => {
    const result = parseDatasetText('week,plot,cover\n1,A,0.31\n2,A,\n1,B,0.12\n', { groupColumn: 'plot' });
    expect(result).toEqual({
      ok: true,
      table: {
        columns: [
          { name: 'week', type: 'number' },
          { name: 'plot', type: 'text' },
          { name: 'cover', type: 'number' },
        ],
        rows: [
          [1, 'A', 0.31],
          [2, 'A', null],
          [1, 'B', 0.12],
        ],
      },
    });
  });

  it('detects tabs and semicolons as separators', () => {
    for (const separator of ['\t', ';']) {
      const result = parseDatasetText(['t', 'x'].join(separator) + '\n0' + separator + '2.5\n');
      expect(result.ok && result.table.rows).toEqual([[0, 2.5]]);
    }
  });

  it('accepts plain and scientific numbers only', () => {
    expect(readNumber(' -1.5e-3 ')).toBe(-0.0015);
    expect(readNumber('.5')).toBe(0.5);
    for (const text of ['1,5', 'n/a', 'Infinity', '0x1F', '1e999', '']) expect(readNumber(text)).toBeNull();
  });

  it('lists several faults for the preview, each with its row and column', () => {
    // A column is numeric when most of its filled cells are numbers: here 3 of 5.
    const result = parseDatasetText('t,x\n0,1\n1,abc\n2,?\n3,4\n4,5\n', { maxFaults: 10 });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.faults.map((fault) => [fault.row, fault.column])).toEqual([
      [3, 'x'],
      [4, 'x'],
    ]);
  });

  it('counts skipped blank lines in the row numbers it reports', () => {
    const result = parseDatasetText('t,x\n0,1\n\n1,oops\n');
    expect(!result.ok && result.faults[0]!.row).toBe(4);
  });

  it('checks time order within each group, not across groups', () => {
    const text = 't,site,x\n0,a,1\n5,a,2\n0,b,3\n5,b,4\n';
    expect(parseDatasetText(text, { groupColumn: 'site' }).ok).toBe(true);
    const whole = parseDatasetText(text);
    expect(!whole.ok && whole.faults[0]!.message).toMatch(/row 4, column t: time 0 comes after 5/);
  });

  it('refuses a header without data rows, and duplicate column names', () => {
    const headerOnly = parseDatasetText('t,x\n');
    expect(!headerOnly.ok && headerOnly.faults[0]!.kind).toBe('empty');
    const twice = parseDatasetText('t,x,x\n0,1,2\n');
    expect(!twice.ok && twice.faults[0]!.message).toMatch(/two columns are named 'x'/);
  });

  it('drops a UTF-8 byte-order mark before the first column name', () => {
    const withMark = new Uint8Array([0xef, 0xbb, 0xbf, ...bytes('t,x\n0,1\n')]);
    const result = parseDatasetBytes(withMark);
    expect(result.ok && result.table.columns[0]!.name).toBe('t');
  });
});
