import { isIdentity } from './correlation';
import type { SimulationCell } from './document';
import type { SheetIssue } from './issues';
import { MAX_STEPS } from '../engine/limits';
import { hasDiagonalOrScalarNoise } from './noise-structure';
import { stepCount } from './step-count';
import { findModel, wrongReference, type SheetIndex } from './sheet-index';

const METHOD_NAMES = {
  'euler-maruyama': 'Euler–Maruyama',
  milstein: 'Milstein',
  heun: 'stochastic Heun',
} as const;

/** The model reference, the time grid, overrides, boundaries and the method against the model. */
export function checkSimulation(index: SheetIndex, sim: SimulationCell): SheetIssue[] {
  const issues: SheetIssue[] = [];
  const issue = (path: (string | number)[], message: string) =>
    issues.push({ cellId: sim.id, path, message });

  if (sim.steps !== undefined && sim.stepSize !== undefined)
    issue(['steps'], 'give either a number of steps or a step size, not both');
  if (sim.steps === undefined && sim.stepSize === undefined)
    issue(['steps'], 'give a number of steps or a step size');
  if (!(sim.t1 > sim.t0)) issue(['t1'], `the end time (${sim.t1}) must be after the start time (${sim.t0})`);
  else if (sim.steps === undefined && sim.stepSize !== undefined && stepCount(sim) > MAX_STEPS) {
    issue(
      ['stepSize'],
      `a step size of ${sim.stepSize} over [${sim.t0}, ${sim.t1}] gives ${stepCount(sim).toLocaleString('en')} steps, more than the limit of ${MAX_STEPS.toLocaleString('en')}; use a larger step size`,
    );
  }

  for (const name of Object.keys(sim.overrides)) {
    if (!index.parameters.has(name))
      issue(['overrides', name], `there is no parameter '${name}' to override`);
  }

  const model = findModel(index, sim.model);
  if (!model) {
    issue(['model'], wrongReference(index, sim.model, 'model'));
    return issues;
  }
  const stateNames = model.states.map((s) => s.name);
  for (const name of Object.keys(sim.boundaries)) {
    if (!stateNames.includes(name)) {
      issue(
        ['boundaries', name],
        `'${name}' is not a state variable of model '${model.id}'; its states are: ${stateNames.join(', ')}`,
      );
    }
  }

  const method = METHOD_NAMES[sim.method];
  if (sim.method === 'heun' && model.calculus !== 'stratonovich') {
    issue(
      ['method'],
      `${method} solves the Stratonovich form, and model '${model.id}' is written in Itô form: use Euler–Maruyama or Milstein, or set the model's calculus to Stratonovich`,
    );
  }
  if (sim.method !== 'heun' && model.calculus === 'stratonovich') {
    issue(
      ['method'],
      `${method} solves the Itô form, and model '${model.id}' is written in Stratonovich form: use stochastic Heun, or rewrite the model in Itô form`,
    );
  }
  if (sim.method === 'milstein') {
    if (!hasDiagonalOrScalarNoise(model)) {
      issue(
        ['method'],
        `Milstein needs scalar noise (one source) or diagonal noise (each state driven by its own source); model '${model.id}' has neither: use Euler–Maruyama`,
      );
    } else if (model.noises.length > 1 && model.correlation !== undefined && !isIdentity(model.correlation)) {
      // Correlating the sources mixes them into every state, so the noise is no longer diagonal.
      issue(
        ['method'],
        `Milstein needs independent noise sources, and model '${model.id}' correlates them: use Euler–Maruyama`,
      );
    }
  }
  return issues;
}
