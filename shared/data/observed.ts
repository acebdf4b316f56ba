/**
 * Observed data as the run sees it: what a data cell's output carries and what a fit, a chart
 * overlay or a calibration read-out reads. The data cell resolves its stored dataset into this
 * shape (columns mapped to state variables, rows split by group, times ascending within a group).
 */

/** One value column tied to a state variable of a model. */
export interface ObservedColumn {
  /** The dataset's column name, as uploaded. */
  column: string;
  /** The state variable it observes. */
  state: string;
  /** The unit the observations are in (may be empty). */
  unit: string;
}

/** One independent series: a site, a replicate, or the whole file when there is no group column. */
export interface ObservedSeries {
  /** The group's value in the group column, or null when the data has no group column. */
  group: string | null;
  /** Observation times, strictly ascending. */
  times: number[];
  /** Per observed state: one value per time, null where the cell was empty (a missing value). */
  values: Record<string, (number | null)[]>;
}

export interface ObservedData {
  datasetId: string;
  /** SHA-256 of the uploaded file, hex. */
  checksum: string;
  /** The dataset's name as shown to people. */
  name: string;
  columns: ObservedColumn[];
  series: ObservedSeries[];
}
