import type { Method } from '../../sheet/document';
import type { ModelSpec } from '../plan';
import { eulerMaruyamaStep } from './euler-maruyama';
import { heunStep } from './heun';
import { milsteinStep } from './milstein';
import { statesMentioned, type StepSource } from './source-tools';

export type { StepSource } from './source-tools';

/** Additive noise (no diffusion depends on the state): Itô and Stratonovich forms coincide. */
export function hasAdditiveNoise(model: ModelSpec): boolean {
  return model.diffusion.every((row) => row.every((source) => statesMentioned(source).length === 0));
}

/** The step of `method` for `model`, after checking that the pair makes sense. */
export function stepSourceFor(model: ModelSpec, method: Method): StepSource {
  const additive = hasAdditiveNoise(model);
  if (method === 'heun') {
    if (model.calculus !== 'stratonovich' && !additive) {
      throw new RangeError(
        'stochastic Heun solves Stratonovich models; this model is in Itô form (use Euler–Maruyama or Milstein, or switch the model to Stratonovich)',
      );
    }
    return heunStep(model);
  }
  if (model.calculus === 'stratonovich' && !additive) {
    const name = method === 'milstein' ? 'Milstein' : 'Euler–Maruyama';
    throw new RangeError(
      `${name} solves Itô models; this model is in Stratonovich form (use stochastic Heun)`,
    );
  }
  return method === 'milstein' ? milsteinStep(model) : eulerMaruyamaStep(model);
}
