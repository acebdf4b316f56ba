import type { SimulationPlan } from '../engine/plan';
import type { ObservedData } from '../data/observed';
import type { FitResult } from '../fit/problem';
import type { ProbeEstimate, SimulationResult, StudyResult } from '../engine/result';
import type { ScenariosResult } from './scenarios-result';
import type { SweepResult } from './sweep-result';

/**
 * What a run leaves on a cell: one type for every runner (browser, command line, tests). Charts
 * show the output of the simulation they name. Its plain JSON form, what the command-line runner
 * prints, is in output-json.ts.
 */
export type CellOutput =
  | {
      kind: 'simulation';
      plan: SimulationPlan;
      result: SimulationResult;
      /** The engine version that computed it (shared/engine/version.ts). */
      engineVersion: number;
      finishedAt: Date;
      seconds: number;
    }
  | { kind: 'probe'; estimate: ProbeEstimate; finishedAt: Date }
  | { kind: 'study'; plan: SimulationPlan; result: StudyResult; finishedAt: Date; seconds: number }
  | { kind: 'data'; observed: ObservedData; finishedAt: Date }
  | { kind: 'fit'; result: FitResult; finishedAt: Date; seconds: number }
  | { kind: 'sweep'; result: SweepResult; finishedAt: Date; seconds: number }
  | { kind: 'scenarios'; result: ScenariosResult; finishedAt: Date; seconds: number }
  | { kind: 'error'; message: string; finishedAt: Date };
