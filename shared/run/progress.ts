/** How far a running cell has got: the one progress type of every runner (browser, command line, tests). */
export interface RunProgress {
  pathsDone: number;
  paths: number;
  elapsedMs: number;
  /** Estimated time left, null until the first paths are done. */
  etaMs: number | null;
  /** What is counted, when not paths (a fit counts likelihood evaluations). */
  unit?: string;
  /**
   * A run of many points (sweep, scenarios): which point runs now (from 1), of how many, and the
   * share of that point's paths done (0 to 1); pathsDone and paths above count every point.
   */
  point?: { index: number; count: number; share: number };
}
