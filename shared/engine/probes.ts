import type { ProbeEstimate, ProbeRequest, SimulationResult } from './result';

export function evaluateProbe(result: SimulationResult, probe: ProbeRequest): ProbeEstimate {
  void result; void probe;
  throw new Error('evaluateProbe: not implemented yet');
}
