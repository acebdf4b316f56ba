/** How far a running cell has got: the one progress type of every runner (browser, command line, tests). */
export interface RunProgress {
  pathsDone: number;
  paths: number;
  elapsedMs: number;
  /** Estimated time left, null until the first paths are done. */
  etaMs: number | null;
  /** What is counted, when not paths (a fit counts likelihood evaluations). */
  unit?: string;
}
