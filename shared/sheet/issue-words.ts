import { kindOf } from '../cells/registry';
import type { SheetDocument } from './document';
import type { SheetIssue } from './issues';

/**
 * An issue in the words a person sees on the page: the cell by its kind and title, the field by
 * its label ("Model 'Mean-reverting anomaly', drift of x: unknown name 'k'"), never internal ids
 * or array paths. Used for the reason a run is refused and for a run's failure messages.
 */

/** Labels of fields as the editors caption them; a field not listed keeps its own name. */
const FIELD_LABELS: Record<string, string> = {
  t0: 'start time',
  t1: 'end time',
  stepSize: 'step size',
  saveCount: 'saved times',
  samplePaths: 'sample paths',
  blowupBound: 'blow-up bound',
  stateY: 'second state',
  coarsestSteps: 'coarsest steps',
  initial: 'initial value',
  exact: 'exact solution',
  min: 'minimum',
  max: 'maximum',
  schemaVersion: 'format version',
  subSteps: 'sub-steps',
};

function label(field: string | number): string {
  return typeof field === 'number' ? String(field + 1) : (FIELD_LABELS[field] ?? field);
}

function fieldWords(doc: SheetDocument, cellId: string, path: readonly (string | number)[]): string {
  const cell = doc.cells.find((c) => c.id === cellId);
  const [list, index, field, ...rest] = path;
  if (cell?.kind === 'model' && list === 'states' && typeof index === 'number') {
    const name = cell.states[index]?.name || `state ${index + 1}`;
    if (field === 'diffusion' && rest[0] !== undefined) return `diffusion of ${name} by ${String(rest[0])}`;
    return field === undefined ? `state ${name}` : `${label(field)} of ${name}`;
  }
  if (cell?.kind === 'model' && list === 'noises' && typeof index === 'number') {
    return `name of noise source ${cell.noises[index]?.name || index + 1}`;
  }
  if (cell?.kind === 'params' && list === 'params' && typeof index === 'number') {
    const name = cell.params[index]?.name || `parameter ${index + 1}`;
    return field === undefined ? `parameter ${name}` : `${label(field)} of ${name}`;
  }
  if (cell?.kind === 'fit' && list === 'parameters' && typeof index === 'number')
    return `parameter ${cell.parameters[index] ?? index + 1} to estimate`;
  if (cell?.kind === 'fit' && list === 'method') return 'likelihood';
  if (list === 'overrides' && typeof index === 'string') return `override of ${index}`;
  if (list === 'boundaries' && typeof index === 'string') return `boundary of ${index}`;
  return path.map(label).join(', ');
}

/** "Model 'Mean-reverting anomaly'", or the kind alone when the cell has no title. */
export function cellInWords(doc: SheetDocument, cellId: string): string {
  const cell = doc.cells.find((c) => c.id === cellId);
  if (!cell) return 'a cell no longer in the sheet';
  const kind = kindOf(cell);
  const title = kind.title(cell).trim();
  return title ? `${kind.label} '${title}'` : kind.label;
}

export function issueInWords(doc: SheetDocument, issue: SheetIssue): string {
  const where = issue.path.length > 0 ? `, ${fieldWords(doc, issue.cellId, issue.path)}` : '';
  return `${cellInWords(doc, issue.cellId)}${where}: ${issue.message}`;
}
