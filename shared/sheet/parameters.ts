import { evaluate, type CheckedExpr } from '../expr';
import { checkField } from './expression-issues';
import type { SheetIssue } from './issues';
import type { SheetIndex } from './sheet-index';

export interface ParameterAnalysis {
  issues: SheetIssue[];
  /** Checked expression of each expression-valued parameter whose text is valid. */
  trees: ReadonlyMap<string, CheckedExpr>;
  /** Names in an order where each comes after the parameters it reads; null when there is a cycle. */
  order: readonly string[] | null;
}

/**
 * Checks every parameter expression (scope: all parameters) and the dependency graph between
 * parameters. A cycle is reported once, at the parameter where it closes:
 * "parameter 'a' depends on itself through b → c → a".
 */
export function analyseParameters(index: SheetIndex): ParameterAnalysis {
  const issues: SheetIssue[] = [];
  const trees = new Map<string, CheckedExpr>();
  for (const cell of index.paramsCells) {
    cell.params.forEach((parameter, i) => {
      if (typeof parameter.value !== 'string') return;
      const tree = checkField(issues, cell.id, ['params', i, 'value'], parameter.value, index.parameterNames);
      const entry = index.parameters.get(parameter.name);
      if (tree && entry?.cellId === cell.id && entry.index === i) trees.set(parameter.name, tree);
    });
  }

  const reads = (name: string): readonly string[] => trees.get(name)?.names ?? [];
  const state = new Map<string, 'open' | 'done'>();
  const order: string[] = [];
  const stack: string[] = [];
  let cyclic = false;

  const visit = (name: string): void => {
    state.set(name, 'open');
    stack.push(name);
    for (const next of reads(name)) {
      const seen = state.get(next);
      if (seen === 'open') {
        cyclic = true;
        const loop = stack.slice(stack.indexOf(next) + 1);
        const entry = index.parameters.get(next);
        if (entry) {
          issues.push({
            cellId: entry.cellId,
            path: ['params', entry.index, 'value'],
            message:
              loop.length === 0
                ? `parameter '${next}' depends on itself`
                : `parameter '${next}' depends on itself through ${[...loop, next].join(' → ')}`,
          });
        }
      } else if (seen === undefined) {
        visit(next);
      }
    }
    stack.pop();
    state.set(name, 'done');
    order.push(name);
  };
  for (const name of index.parameterNames) if (!state.has(name)) visit(name);

  return { issues, trees, order: cyclic ? null : order };
}

export interface ParameterValues {
  values: Record<string, number>;
  /** Parameters whose value could not be computed (not finite, or reads one that failed). */
  failures: { name: string; message: string }[];
}

/** Values in dependency order; an override replaces a parameter's own value or expression. */
export function evaluateParameters(
  index: SheetIndex,
  analysis: ParameterAnalysis,
  overrides: Readonly<Record<string, number>> = {},
): ParameterValues {
  const values: Record<string, number> = {};
  const failures: ParameterValues['failures'] = [];
  for (const name of analysis.order ?? []) {
    const entry = index.parameters.get(name);
    if (!entry) continue;
    const own = entry.parameter.value;
    const tree = analysis.trees.get(name);
    let value: number;
    if (Object.hasOwn(overrides, name)) value = overrides[name] ?? Number.NaN;
    else if (typeof own === 'number') value = own;
    else if (tree && tree.names.every((n) => Object.hasOwn(values, n))) value = evaluate(tree, values);
    else continue;
    if (!Number.isFinite(value)) {
      failures.push({ name, message: `parameter '${name}' evaluates to ${value}, not a finite number` });
      continue;
    }
    values[name] = value;
  }
  return { values, failures };
}
