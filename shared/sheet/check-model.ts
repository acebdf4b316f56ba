import { evaluate } from '../expr';
import { checkCorrelation } from './correlation';
import type { ModelCell } from './document';
import { checkField } from './expression-issues';
import type { SheetIssue } from './issues';
import { modelScopes, type SheetIndex } from './sheet-index';

/**
 * A model's expressions, each in its scope; diffusion keys naming noise sources; the correlation
 * matrix; initial values that come out finite (when the parameter values are known).
 */
export function checkModel(
  index: SheetIndex,
  model: ModelCell,
  parameterValues: Readonly<Record<string, number>> | null,
): SheetIssue[] {
  const issues: SheetIssue[] = [];
  const scopes = modelScopes(index, model);
  const noiseNames = model.noises.map((n) => n.name);

  model.states.forEach((state, i) => {
    const at = (...rest: (string | number)[]) => ['states', i, ...rest];
    const initial = checkField(issues, model.id, at('initial'), state.initial, scopes.initial);
    if (initial && parameterValues && initial.names.every((n) => Object.hasOwn(parameterValues, n))) {
      const value = evaluate(initial, parameterValues);
      if (!Number.isFinite(value)) {
        issues.push({
          cellId: model.id,
          path: at('initial'),
          message: `the initial value of '${state.name}' evaluates to ${value}`,
        });
      }
    }
    checkField(issues, model.id, at('drift'), state.drift, scopes.coefficient);
    for (const [noise, text] of Object.entries(state.diffusion)) {
      if (!noiseNames.includes(noise)) {
        const known =
          noiseNames.length > 0
            ? `the noise sources are: ${noiseNames.join(', ')}`
            : 'this model has no noise sources';
        issues.push({
          cellId: model.id,
          path: at('diffusion', noise),
          message: `'${noise}' is not a noise source of this model; ${known}`,
        });
        continue;
      }
      checkField(issues, model.id, at('diffusion', noise), text, scopes.coefficient);
    }
    if (state.exact !== undefined && state.exact.trim() !== '')
      checkField(issues, model.id, at('exact'), state.exact, scopes.exact);
  });

  if (model.correlation !== undefined)
    issues.push(...checkCorrelation(model.id, model.correlation, model.noises.length));
  return issues;
}
