import Papa from 'papaparse';
import { DATASET_LIMITS, type DatasetColumn, type DatasetValue } from '../api/datasets';

/**
 * Reads an uploaded CSV or TSV file into a table: the browser's preview and the server's upload
 * run this same code, so the preview shows exactly the faults the server would refuse. Rows are
 * numbered as a spreadsheet shows them: the header is row 1, the first data row is row 2.
 */

export interface ParsedTable {
  columns: DatasetColumn[];
  rows: DatasetValue[][];
}

export type TableFaultKind =
  | 'empty'
  | 'not_text'
  | 'encoding'
  | 'not_delimited'
  | 'bad_header'
  | 'ragged_row'
  | 'not_a_number'
  | 'missing_time'
  | 'time_order'
  | 'unknown_column'
  | 'too_many_rows'
  | 'too_many_columns';

export interface TableFault {
  kind: TableFaultKind;
  message: string;
  /** Row of the file (the header is row 1), where the fault is in one row. */
  row?: number;
  /** Column name, where the fault is in one column. */
  column?: string;
}

export type ParseTableResult = { ok: true; table: ParsedTable } | { ok: false; faults: TableFault[] };

export interface ParseTableOptions {
  /** The column holding observation times (default: the first column). */
  timeColumn?: string;
  /** The column naming independent series; times are checked in order within each. */
  groupColumn?: string;
  /** Faults to collect before stopping (the preview lists several, the server reports the first). */
  maxFaults?: number;
}

/** A plain decimal or scientific number, nothing else ("1,5", "n/a", "Inf" and "0x1F" are not). */
const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

export function readNumber(text: string): number | null {
  const trimmed = text.trim();
  if (!NUMBER.test(trimmed)) return null;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : null;
}

const fail = (fault: TableFault): ParseTableResult => ({ ok: false, faults: [fault] });

/** Bytes to text: UTF-8 only (a leading byte-order mark is dropped); binary files are refused. */
export function decodeDatasetBytes(
  bytes: Uint8Array,
): { ok: true; text: string } | { ok: false; fault: TableFault } {
  if (bytes.length === 0) return { ok: false, fault: { kind: 'empty', message: 'the file is empty' } };
  const utf16 = (bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff);
  if (utf16) return { ok: false, fault: encodingFault('it is UTF-16') };
  if (bytes.includes(0))
    return {
      ok: false,
      fault: {
        kind: 'not_text',
        message:
          'the file is not delimited text (it holds binary data): save it as CSV (comma-separated) or TSV (tab-separated) text',
      },
    };
  try {
    const text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
    return { ok: true, text };
  } catch {
    return { ok: false, fault: encodingFault('it is not valid UTF-8') };
  }
}

function encodingFault(why: string): TableFault {
  return {
    kind: 'encoding',
    message: `the file's text encoding is wrong (${why}): save it again as UTF-8 CSV`,
  };
}

export function parseDatasetBytes(bytes: Uint8Array, options: ParseTableOptions = {}): ParseTableResult {
  const decoded = decodeDatasetBytes(bytes);
  return decoded.ok ? parseDatasetText(decoded.text, options) : fail(decoded.fault);
}

export function parseDatasetText(text: string, options: ParseTableOptions = {}): ParseTableResult {
  const maxFaults = options.maxFaults ?? 1;
  if (text.trim() === '') return fail({ kind: 'empty', message: 'the file is empty' });
  const start = text.trimStart().charAt(0);
  if (start === '{' || start === '[' || start === '<')
    return fail({
      kind: 'not_delimited',
      message: `the file is not delimited text (it starts with '${start}', like JSON, XML or HTML): save it as CSV or TSV`,
      row: 1,
    });
  const parsed = Papa.parse<string[]>(text, { delimiter: guessDelimiter(text), skipEmptyLines: false });
  // Row numbers as the person sees them; blank lines are skipped but still counted.
  const records: { row: number; fields: string[] }[] = [];
  parsed.data.forEach((fields, index) => {
    if (fields.length === 1 && fields[0]!.trim() === '') return;
    records.push({ row: index + 1, fields });
  });
  const header = records.shift();
  if (!header) return fail({ kind: 'empty', message: 'the file is empty' });
  if (header.fields.length < 2)
    return fail({
      kind: 'not_delimited',
      message:
        'the file is not delimited text: its first row has no comma, tab or semicolon between column names; a dataset needs a time column and at least one value column',
      row: header.row,
    });
  if (header.fields.length > DATASET_LIMITS.maxColumns)
    return fail({
      kind: 'too_many_columns',
      message: `the file has ${header.fields.length} columns; at most ${DATASET_LIMITS.maxColumns} are allowed`,
    });
  if (records.length > DATASET_LIMITS.maxRows)
    return fail({
      kind: 'too_many_rows',
      message: `the file has ${records.length.toLocaleString('en')} data rows; at most ${DATASET_LIMITS.maxRows.toLocaleString('en')} are allowed`,
    });
  if (records.length === 0)
    return fail({ kind: 'empty', message: 'the file has a header row but no data rows' });
  const names = header.fields.map((name) => name.trim());
  const headerFault = checkHeader(names, header.row);
  if (headerFault) return fail(headerFault);

  const faults: TableFault[] = [];
  for (const record of records) {
    if (record.fields.length !== names.length) {
      faults.push({
        kind: 'ragged_row',
        message: `row ${record.row} has ${record.fields.length} columns, the header has ${names.length}`,
        row: record.row,
      });
      if (faults.length >= maxFaults) return { ok: false, faults };
    }
  }
  if (faults.length > 0) return { ok: false, faults };

  const columns: DatasetColumn[] = names.map((name, c) => ({
    name,
    type: isMostlyNumeric(records, c) ? 'number' : 'text',
  }));
  const timeColumn = options.timeColumn ?? names[0]!;
  const timeIndex = names.indexOf(timeColumn);
  if (timeIndex < 0) return fail(unknownColumn(timeColumn, names, 'time'));
  const groupIndex = options.groupColumn ? names.indexOf(options.groupColumn) : -1;
  if (options.groupColumn && groupIndex < 0) return fail(unknownColumn(options.groupColumn, names, 'group'));
  columns[timeIndex] = { name: timeColumn, type: 'number' };

  const rows: DatasetValue[][] = [];
  for (const record of records) {
    const row: DatasetValue[] = [];
    record.fields.forEach((field, c) => {
      const column = columns[c]!;
      const trimmed = field.trim();
      if (trimmed === '') {
        row.push(null);
        if (c === timeIndex)
          faults.push({
            kind: 'missing_time',
            message: `row ${record.row}, column ${column.name}: the time is missing; every row needs its time`,
            row: record.row,
            column: column.name,
          });
        return;
      }
      if (column.type === 'text') {
        row.push(trimmed);
        return;
      }
      const value = readNumber(trimmed);
      if (value === null)
        faults.push({
          kind: 'not_a_number',
          message: `row ${record.row}, column ${column.name}: '${shorten(trimmed)}' is not a number; leave the cell empty for a missing value`,
          row: record.row,
          column: column.name,
        });
      row.push(value);
    });
    rows.push(row);
    if (faults.length >= maxFaults) return { ok: false, faults: faults.slice(0, maxFaults) };
  }
  if (faults.length > 0) return { ok: false, faults };
  const orderFaults = checkTimeOrder(records, rows, columns, timeIndex, groupIndex, maxFaults);
  if (orderFaults.length > 0) return { ok: false, faults: orderFaults };
  return { ok: true, table: { columns, rows } };
}

/** The separator used most in the first non-blank line: tab, comma or semicolon. */
function guessDelimiter(text: string): string {
  const firstLine = text.split(/\r?\n/).find((line) => line.trim() !== '') ?? '';
  const count = (delimiter: string) => firstLine.split(delimiter).length - 1;
  return ['\t', ',', ';'].reduce((best, candidate) => (count(candidate) > count(best) ? candidate : best));
}

function checkHeader(names: string[], row: number): TableFault | null {
  const blank = names.findIndex((name) => name === '');
  if (blank >= 0)
    return {
      kind: 'bad_header',
      message: `row ${row}: column ${blank + 1} has no name; the first row must name every column`,
      row,
    };
  const seen = new Set<string>();
  for (const name of names) {
    if (seen.has(name))
      return { kind: 'bad_header', message: `row ${row}: two columns are named '${shorten(name)}'`, row };
    seen.add(name);
  }
  return null;
}

function unknownColumn(name: string, names: string[], role: 'time' | 'group'): TableFault {
  return {
    kind: 'unknown_column',
    message: `the file has no column '${shorten(name)}' for the ${role} (it has ${names.join(', ')})`,
    column: name,
  };
}

/** Numeric when at least half of the filled cells read as numbers (ties go to numbers). */
function isMostlyNumeric(records: { fields: string[] }[], column: number): boolean {
  let filled = 0;
  let numbers = 0;
  for (const record of records) {
    const field = record.fields[column]!.trim();
    if (field === '') continue;
    filled += 1;
    if (readNumber(field) !== null) numbers += 1;
  }
  return filled === 0 || numbers * 2 >= filled;
}

function checkTimeOrder(
  records: { row: number }[],
  rows: DatasetValue[][],
  columns: DatasetColumn[],
  timeIndex: number,
  groupIndex: number,
  maxFaults: number,
): TableFault[] {
  const faults: TableFault[] = [];
  const last = new Map<string, number>();
  const timeName = columns[timeIndex]!.name;
  rows.forEach((row, r) => {
    if (faults.length >= maxFaults) return;
    const time = row[timeIndex] as number;
    const group = groupIndex < 0 ? '' : String(row[groupIndex] ?? '');
    const before = last.get(group);
    const where = groupIndex < 0 ? '' : ` in group '${shorten(group)}'`;
    const rowNumber = records[r]!.row;
    if (before !== undefined && time === before)
      faults.push({
        kind: 'time_order',
        message: `row ${rowNumber}, column ${timeName}: time ${time} appears twice${where}; each time may appear once per series`,
        row: rowNumber,
        column: timeName,
      });
    else if (before !== undefined && time < before)
      faults.push({
        kind: 'time_order',
        message: `row ${rowNumber}, column ${timeName}: time ${time} comes after ${before}${where}; sort the rows by time within each series`,
        row: rowNumber,
        column: timeName,
      });
    last.set(group, time);
  });
  return faults;
}

function shorten(text: string): string {
  return text.length > 40 ? `${text.slice(0, 37)}…` : text;
}
