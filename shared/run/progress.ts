/** How far a running cell has got: the one progress type of every runner (browser, command line, tests). */
export interface RunProgress {
  pathsDone: number;
  paths: number;
  elapsedMs: number;
  /** Estimated time left, null until the first paths are done. */
  etaMs: number | null;
  /** A run of many points (sweep, scenarios): which point runs now (from 1), of how many. */
  point?: { index: number; count: number };
}
