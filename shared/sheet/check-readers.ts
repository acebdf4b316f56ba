import type { ChartCell, ModelCell, ProbeCell, SimulationCell, StudyCell } from './document';
import type { SheetIssue } from './issues';
import { findModel, findSimulation, wrongReference, type SheetIndex } from './sheet-index';

type Reader = ChartCell | ProbeCell | StudyCell;

/** Quantities that are read against a level, with how the message names them. */
const LEVEL_QUANTITIES: Partial<Record<ProbeCell['quantity'], string>> = {
  exceedance: 'P(X ≥ level)',
  subceedance: 'P(X ≤ level)',
  'hit-before': 'the probability of hitting a level',
  'first-passage': 'the first-passage time',
};

/** Charts, probes and studies: the simulation they read, the state names and their own arguments. */
export function checkReader(index: SheetIndex, cell: Reader): SheetIssue[] {
  const issues: SheetIssue[] = [];
  const issue = (path: (string | number)[], message: string) =>
    issues.push({ cellId: cell.id, path, message });

  if (cell.kind === 'probe') {
    const what = LEVEL_QUANTITIES[cell.quantity];
    if (what && cell.level === undefined) issue(['level'], `${what} needs a level`);
    if (cell.quantity === 'quantile' && cell.probability === undefined)
      issue(['probability'], 'a quantile needs a probability between 0 and 1');
    if (cell.quantity === 'covariance' || cell.quantity === 'correlation') {
      if (cell.stateY === undefined) issue(['stateY'], `a ${cell.quantity} needs a second state variable`);
      else if (cell.stateY === cell.state)
        issue(['stateY'], `a ${cell.quantity} needs two different state variables`);
    }
  }
  if (cell.kind === 'chart' && cell.view === 'phase' && cell.stateY === undefined) {
    issue(['stateY'], 'a phase chart needs a second state variable');
  }

  const sim = findSimulation(index, cell.simulation);
  if (!sim) {
    issue(['simulation'], wrongReference(index, cell.simulation, 'simulation'));
    return issues;
  }
  const model = findModel(index, sim.model);
  if (!model) return issues; // reported on the simulation cell
  const stateNames = model.states.map((s) => s.name);
  const checkState = (path: string, name: string | undefined) => {
    if (name !== undefined && !stateNames.includes(name)) {
      issue(
        [path],
        `'${name}' is not a state variable of model '${model.id}'; its states are: ${stateNames.join(', ')}`,
      );
    }
  };
  checkState('state', cell.state);
  if (cell.kind === 'chart' || cell.kind === 'probe') checkState('stateY', cell.stateY);

  if (cell.kind !== 'study' && cell.time !== undefined && !(cell.time >= sim.t0 && cell.time <= sim.t1)) {
    issue(['time'], `the time ${cell.time} lies outside the simulated interval [${sim.t0}, ${sim.t1}]`);
  }
  if (cell.kind === 'probe' && cell.quantity === 'extinction') checkExtinction(cell, sim, issue);
  if (cell.kind === 'study' && cell.reference === 'exact') checkExactReference(cell, model, issue);
  return issues;
}

function checkExtinction(
  cell: ProbeCell,
  sim: SimulationCell,
  issue: (path: (string | number)[], message: string) => void,
): void {
  const boundary = Object.hasOwn(sim.boundaries, cell.state) ? sim.boundaries[cell.state] : undefined;
  const absorbsBelow = boundary?.rule === 'absorb' && boundary.side === 'below';
  if (cell.level === undefined && !absorbsBelow) {
    issue(
      ['level'],
      `extinction needs a level, or an absorbing lower boundary on '${cell.state}' in simulation '${sim.id}'`,
    );
  }
}

function checkExactReference(
  cell: StudyCell,
  model: ModelCell,
  issue: (path: (string | number)[], message: string) => void,
): void {
  const states = cell.state === undefined ? model.states : model.states.filter((s) => s.name === cell.state);
  const missing = states.filter((s) => s.exact === undefined || s.exact.trim() === '').map((s) => s.name);
  if (missing.length > 0) {
    issue(
      ['reference'],
      `an exact reference needs an exact solution for ${missing.map((n) => `'${n}'`).join(', ')}; use 'finest' or 'auto'`,
    );
  }
}
