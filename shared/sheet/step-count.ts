import type { SimulationCell } from './document';

/** Steps of a run: given directly, or the step size over [t0, t1] rounded to the nearest whole step (at least one). */
export function stepCount(sim: Pick<SimulationCell, 't0' | 't1' | 'steps' | 'stepSize'>): number {
  if (sim.steps !== undefined) return sim.steps;
  return Math.max(1, Math.round((sim.t1 - sim.t0) / (sim.stepSize ?? sim.t1 - sim.t0)));
}
