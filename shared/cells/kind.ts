import type { SimulationPlan, WatchSpec } from '../engine/plan';
import type { PlanPoint } from '../sheet/plan';
import type { SimulationResult, StudyOptions, StudyResult } from '../engine/result';
import type { Cell, CellKind, ModelCell, SheetDocument, SimulationCell } from '../sheet/document';
import type { SheetIssue } from '../sheet/issues';
import type { SheetIndex } from '../sheet/sheet-index';
import type { CellOutput } from '../run/outputs';
import type { RunProgress } from '../run/progress';
import type { DatasetProvider } from '../data/provider';
import type { EdgeColour } from './colours';
import type { FitProblem, FitResult } from '../fit/problem';

/**
 * What a cell kind is, apart from its Vue editor: everything the document schema, the checker,
 * the dependency order, the fingerprints, "Add cell" and the run orchestrator need to know about
 * it. One definition per kind, in shared/cells/<kind>.ts, listed in shared/cells/registry.ts.
 */
export interface CellKindDefinition<K extends CellKind> {
  kind: K;
  /** "Step-size study": the card's label and the "Add cell" menu entry. */
  label: string;
  /** Lower-case words for aria-labels: "Delete step-size study cell". */
  word: string;
  /** The card's edge colour, one of the palette's named colours. */
  colour: EdgeColour;
  /** Nothing to run: it computes nothing and nothing reads it (a note); its card has no run button. */
  inert?: true;
  /** Why a cell of this kind cannot be added at `index` yet, or null when it can. */
  cannotAdd?(doc: SheetDocument, index: number): string | null;
  /** A sensible new cell, inserted at `index`; `id` is fresh and `taken` holds the names in use. */
  create(context: NewCellContext): Extract<Cell, { kind: K }>;
  /** A short title for the card header, read from the cell's own fields. */
  title(cell: Extract<Cell, { kind: K }>): string;
  /** Ids of the cells this cell reads (may name missing cells; callers filter). */
  reads(cell: Extract<Cell, { kind: K }>, context: ReadsContext): string[];
  /** Problems of this cell beyond its schema, each with the path of its field. */
  check?(cell: Extract<Cell, { kind: K }>, context: CheckContext): SheetIssue[];
  /**
   * What this cell needs a simulation to record beyond its saved grid (extra times, watched
   * levels), or null when it does not read that simulation. Such a cell must be free of problems
   * before the simulation can run, since its requests shape the plan.
   */
  asksOf?(
    cell: Extract<Cell, { kind: K }>,
    simulation: SimulationCell,
    model: ModelCell,
  ): SimulationRequests | null;
  /** The cell whose output this cell shows (a chart shows its simulation's); running it runs that. */
  showsOutputOf?(cell: Extract<Cell, { kind: K }>): string;
  /** How the run orchestrator computes this kind's output; absent for kinds that compute nothing. */
  run?: CellRunStep<K>;
}

export interface SimulationRequests {
  /** Times at which every path's values are kept. */
  times: number[];
  /** Levels whose first passages are recorded. */
  watches: WatchSpec[];
}

export interface NewCellContext {
  id: string;
  doc: SheetDocument;
  index: number;
  /** Every name the sheet defines already (parameters, states, noises). */
  taken: ReadonlySet<string>;
}

export interface ReadsContext {
  paramsCellIds: readonly string[];
  /** The params cell that defines each parameter name (the first one wins). */
  definedIn: ReadonlyMap<string, string>;
}

export interface CheckContext {
  index: SheetIndex;
  /** Parameter values, when every parameter could be evaluated. */
  parameterValues: Readonly<Record<string, number>> | null;
}

export interface CellRunStep<K extends CellKind> {
  /** Steps run by rank, then in sheet order: simulations (0) before what reads them (1). */
  rank: number;
  /** Cells that must have a current output before this one runs (run if they have none). */
  needs?(cell: Extract<Cell, { kind: K }>): string[];
  /** Whether a kept output whose inputs did not change can still stand (default: yes). */
  stillCurrent?(cell: Extract<Cell, { kind: K }>, output: CellOutput, context: RunStepContext): boolean;
  execute(cell: Extract<Cell, { kind: K }>, context: RunStepContext): Promise<CellOutput>;
}

/** Where the numbers are computed: a worker pool, worker_threads, or the calling thread. */
export interface RunExecutor {
  runSimulation(
    plan: SimulationPlan,
    onProgress?: (progress: RunProgress) => void,
  ): Promise<SimulationResult>;
  runStudy(
    plan: SimulationPlan,
    options: StudyOptions,
    onProgress?: (progress: RunProgress) => void,
  ): Promise<StudyResult>;
  /** A parameter fit (shared/fit/fit-model.ts); absent where the runner cannot fit. */
  runFit?(problem: FitProblem, onProgress?: (progress: RunProgress) => void): Promise<FitResult>;
}

/** What the orchestrator gives a run step. */
export interface RunStepContext {
  doc: SheetDocument;
  executor: RunExecutor;
  /** The step was asked for by the person (not only needed by another step). */
  forced: boolean;
  /** The engine plan of a simulation cell, built once per run. */
  plan(simulationId: string): SimulationPlan;
  /**
   * The plan of one point of a run of many (sweep, scenarios): overrides, kernel inputs, paths
   * and seed on top of the simulation's plan. Built fresh each call (points differ).
   */
  pointPlan(simulationId: string, point: PlanPoint): SimulationPlan;
  /** Parameters whose values differ between these points' overrides (to compile as kernel inputs). */
  varyingParameters(simulationId: string, points: readonly Readonly<Record<string, number>>[]): string[];
  /** The person cancelled the run: a step of many runs stops between them. */
  isCancelled(): boolean;
  /** The current output of another cell: this run's, or a kept one whose inputs have not changed. */
  currentOutput(cellId: string): CellOutput | undefined;
  /** Stored datasets' rows, for data cells; absent where the runner has none. */
  datasets?: DatasetProvider;
  onProgress(progress: RunProgress): void;
}
