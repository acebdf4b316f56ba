import type { SimulationPlan } from './plan';
import type { StudyOptions, StudyResult } from './result';

export function runStudy(plan: SimulationPlan, options: StudyOptions): StudyResult {
  void plan; void options;
  throw new Error('runStudy: not implemented yet');
}
