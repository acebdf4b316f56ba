import type { DatasetColumn, DatasetValue } from '../api/datasets';
import type { ObservedColumn, ObservedData, ObservedSeries } from './observed';

/**
 * A stored table seen through a data cell's mapping: the time column, the value columns tied to
 * states, and an optional group column splitting the rows into independent series. Throws with a
 * plain message when the mapping does not fit the table (the run shows it on the data cell).
 */

export interface DatasetRef {
  datasetId: string;
  checksum: string;
  name: string;
}

export interface ObservationMapping {
  timeColumn: string;
  columns: ObservedColumn[];
  groupColumn?: string;
}

export interface StoredTable {
  columns: DatasetColumn[];
  rows: DatasetValue[][];
}

export function observedFromTable(
  table: StoredTable,
  ref: DatasetRef,
  mapping: ObservationMapping,
): ObservedData {
  const names = table.columns.map((column) => column.name);
  const find = (name: string, role: string): number => {
    const index = names.indexOf(name);
    if (index < 0)
      throw new Error(`the dataset has no column '${name}' for the ${role} (it has ${names.join(', ')})`);
    return index;
  };
  const timeIndex = find(mapping.timeColumn, 'time');
  if (table.columns[timeIndex]!.type !== 'number')
    throw new Error(`column '${mapping.timeColumn}' holds text, not times`);
  const valueIndexes = mapping.columns.map((column) => {
    const index = find(column.column, `state ${column.state}`);
    if (table.columns[index]!.type !== 'number')
      throw new Error(`column '${column.column}' holds text, not numbers: it cannot observe ${column.state}`);
    return index;
  });
  const groupIndex = mapping.groupColumn === undefined ? -1 : find(mapping.groupColumn, 'group');

  const byGroup = new Map<string | null, ObservedSeries>();
  table.rows.forEach((row, r) => {
    const time = row[timeIndex];
    if (typeof time !== 'number') throw new Error(`row ${r + 2} has no time`);
    const group = groupIndex < 0 ? null : String(row[groupIndex] ?? '');
    let series = byGroup.get(group);
    if (!series) {
      series = {
        group,
        times: [],
        values: Object.fromEntries(mapping.columns.map((column) => [column.state, []])),
      };
      byGroup.set(group, series);
    }
    const previous = series.times.at(-1);
    if (previous !== undefined && !(time > previous)) {
      const where = group === null ? '' : ` in group '${group}'`;
      throw new Error(
        `row ${r + 2}: time ${time} does not come after ${previous}${where}; pick the group column, or sort the file by time`,
      );
    }
    series.times.push(time);
    mapping.columns.forEach((column, i) => {
      const value = row[valueIndexes[i]!];
      series.values[column.state]!.push(typeof value === 'number' ? value : null);
    });
  });
  return {
    datasetId: ref.datasetId,
    checksum: ref.checksum,
    name: ref.name,
    columns: mapping.columns.map((column) => ({ ...column })),
    series: [...byGroup.values()],
  };
}

/** Observed points of one state, every series together: what a chart overlays. */
export function observedPoints(
  observed: ObservedData,
  state: string,
): { times: number[]; values: number[]; groups: (string | null)[] } {
  const times: number[] = [];
  const values: number[] = [];
  const groups: (string | null)[] = [];
  for (const series of observed.series) {
    const column = series.values[state];
    if (!column) continue;
    column.forEach((value, i) => {
      if (value === null) return;
      times.push(series.times[i]!);
      values.push(value);
      groups.push(series.group);
    });
  }
  return { times, values, groups };
}
