import type { SheetIssue } from './issues';
import { reservedNameProblem } from './names';
import type { SheetIndex } from './sheet-index';

/** Duplicate cell ids: every cell after the first with the same id is marked. */
export function checkCellIds(index: SheetIndex): SheetIssue[] {
  const seen = new Set<string>();
  const issues: SheetIssue[] = [];
  for (const cell of index.doc.cells) {
    if (seen.has(cell.id))
      issues.push({
        cellId: cell.id,
        path: ['id'],
        message: `cell id '${cell.id}' is used by more than one cell`,
      });
    seen.add(cell.id);
  }
  return issues;
}

/**
 * Names of parameters (across all params cells), and of each model's states and noise sources:
 * no duplicates, no reserved words, and a model's names may not shadow a parameter.
 */
export function checkNames(index: SheetIndex): SheetIssue[] {
  const issues: SheetIssue[] = [];
  const reserved = (cellId: string, path: (string | number)[], name: string) => {
    const problem = reservedNameProblem(name);
    if (problem) issues.push({ cellId, path, message: problem });
  };

  for (const cell of index.paramsCells) {
    cell.params.forEach((parameter, i) => {
      const path = ['params', i, 'name'];
      reserved(cell.id, path, parameter.name);
      const first = index.parameters.get(parameter.name);
      if (first && (first.cellId !== cell.id || first.index !== i)) {
        const where = first.cellId === cell.id ? 'earlier in this cell' : `in cell '${first.cellId}'`;
        issues.push({
          cellId: cell.id,
          path,
          message: `parameter '${parameter.name}' is already defined ${where}`,
        });
      }
    });
  }

  for (const cell of index.doc.cells) {
    if (cell.kind !== 'model') continue;
    const own = new Map<string, string>();
    const declare = (what: 'state' | 'noise source', name: string, path: (string | number)[]) => {
      reserved(cell.id, path, name);
      const earlier = own.get(name);
      if (earlier) {
        issues.push({
          cellId: cell.id,
          path,
          message: `${what} '${name}' has the same name as ${earlier} '${name}' in this model`,
        });
      }
      own.set(name, earlier ?? what);
      const parameter = index.parameters.get(name);
      if (parameter) {
        issues.push({
          cellId: cell.id,
          path,
          message: `${what} '${name}' in cell '${cell.id}' has the same name as parameter '${name}' in cell '${parameter.cellId}'; rename one of them`,
        });
      }
    };
    cell.states.forEach((state, i) => declare('state', state.name, ['states', i, 'name']));
    cell.noises.forEach((noise, j) => declare('noise source', noise.name, ['noises', j, 'name']));
  }
  return issues;
}
