import { checkExpression, symbolTex, toTex, toTexFactor } from '@shared/expr';
import type { ModelCell, SheetDocument } from '@shared/sheet/document';
import { indexSheet, modelScopes } from '@shared/sheet/sheet-index';

/** A piece of a model as TeX, or the text as typed when it does not pass the checker (never typeset). */
export type TexOrText = { ok: true; tex: string } | { ok: false; text: string; problem: string };

export interface StateEquation {
  name: string;
  unit: string;
  /** dX = f dt + Σ g_j dW_j (∘ dW_j in Stratonovich form). */
  equation: TexOrText;
  /** X at the start time. */
  initial: TexOrText;
}

/**
 * The model as its system of equations, one per state, from the checked expression trees
 * (shared/expr toTex), with each state's unit. A coefficient that does not check is returned as
 * its text with the problem, for the reading view to show as code.
 */
export function modelEquations(model: ModelCell, document: SheetDocument): StateEquation[] {
  const scopes = modelScopes(indexSheet(document), model);
  const noiseDifferential = model.calculus === 'stratonovich' ? '\\circ d' : '\\,d';
  return model.states.map((state) => {
    const symbol = symbolTex(state.name);
    const drift = checkExpression(state.drift, scopes.coefficient);
    const terms: string[] = [];
    const failures: string[] = [];
    if (drift.ok) terms.push(`${toTexFactor(drift.tree)}\\,dt`);
    else failures.push(`drift: ${drift.errors[0]?.message ?? 'not valid'}`);
    for (const noise of model.noises) {
      const text = Object.hasOwn(state.diffusion, noise.name) ? state.diffusion[noise.name] : undefined;
      if (text === undefined || text.trim() === '') continue;
      const checked = checkExpression(text, scopes.coefficient);
      if (checked.ok) terms.push(`${toTexFactor(checked.tree)}${noiseDifferential}${symbolTex(noise.name)}`);
      else failures.push(`diffusion by ${noise.name}: ${checked.errors[0]?.message ?? 'not valid'}`);
    }
    const equation: TexOrText =
      failures.length > 0
        ? { ok: false, text: describeTyped(state, model), problem: failures.join('; ') }
        : { ok: true, tex: `d${symbol} = ${joinTerms(terms)}` };
    const initialCheck = checkExpression(state.initial, scopes.initial);
    const initial: TexOrText = initialCheck.ok
      ? { ok: true, tex: `${symbol}(t_0) = ${toTex(initialCheck.tree)}` }
      : { ok: false, text: state.initial, problem: initialCheck.errors[0]?.message ?? 'not valid' };
    return { name: state.name, unit: state.unit ?? '', equation, initial };
  });
}

/** Terms joined with "+", a leading minus sign turned into "−" between terms. */
function joinTerms(terms: readonly string[]): string {
  if (terms.length === 0) return '0';
  return terms
    .map((term, i) => (i === 0 ? term : term.startsWith('-') ? ` - ${term.slice(1)}` : ` + ${term}`))
    .join('');
}

function describeTyped(state: ModelCell['states'][number], model: ModelCell): string {
  const noises = model.noises
    .filter((noise) => Object.hasOwn(state.diffusion, noise.name))
    .map((noise) => ` + (${state.diffusion[noise.name]}) d${noise.name}`)
    .join('');
  return `d${state.name} = (${state.drift}) dt${noises}`;
}
