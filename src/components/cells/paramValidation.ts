import { symbolNameSchema, type Parameter } from '@shared/sheet/document';
import { numberToText, parseNumberText } from './numberText';
import { expressionProblems, type ScopeName } from './expressionCheck';

/** Text of one parameter row as typed, before it is accepted into the cell. */
export interface ParamRowText {
  name: string;
  value: string;
  unit: string;
  min: string;
  max: string;
  description: string;
}

export type ParamField = keyof ParamRowText;

export type ParamRowErrors = Partial<Record<ParamField, string>>;

export function paramToText(param: Parameter): ParamRowText {
  return {
    name: param.name,
    value: typeof param.value === 'number' ? String(param.value) : param.value,
    unit: param.unit ?? '',
    min: numberToText(param.min),
    max: numberToText(param.max),
    description: param.description ?? '',
  };
}

/** A symbol name's problem, or null: the schema's own rule, plus clashes with reserved names. */
export function nameProblem(
  name: string,
  takenElsewhere: readonly string[],
  reserved: readonly string[],
): string | null {
  const trimmed = name.trim();
  if (trimmed === '') return 'A name is needed.';
  const parsed = symbolNameSchema.safeParse(trimmed);
  if (!parsed.success)
    return `"${trimmed}" is not a valid name: ${parsed.error.issues[0]?.message ?? 'bad name'}.`;
  if (reserved.includes(trimmed))
    return `"${trimmed}" is reserved (a function or built-in name); choose another.`;
  if (takenElsewhere.includes(trimmed)) return `"${trimmed}" is already used in this sheet.`;
  return null;
}

export interface ParamCheckContext {
  /** Names of the other parameters in the sheet (the row's own excluded). */
  otherNames: readonly string[];
  /** Names no parameter may take (t, pi, function names, state variables). */
  reserved: readonly string[];
}

/**
 * Every problem of a typed row, by field. A value is a number or an expression of the other
 * parameters; min and max are numbers with min ≤ max; a numeric value outside them is flagged.
 */
export function checkParamRow(row: ParamRowText, context: ParamCheckContext): ParamRowErrors {
  const errors: ParamRowErrors = {};
  const name = nameProblem(row.name, context.otherNames, context.reserved);
  if (name) errors.name = name;

  const min = row.min.trim() === '' ? null : parseNumberText(row.min, 'min');
  const max = row.max.trim() === '' ? null : parseNumberText(row.max, 'max');
  if (min && !min.ok) errors.min = min.message;
  if (max && !max.ok) errors.max = max.message;
  if (min?.ok && max?.ok && max.value < min.value)
    errors.max = `Max (${max.value}) is below min (${min.value}).`;

  const value = valueProblem(row.value, context.otherNames);
  if (value) errors.value = value;
  else {
    const numeric = parseNumberText(row.value);
    if (numeric.ok && min?.ok && numeric.value < min.value)
      errors.value = `The value is below min (${min.value}).`;
    if (numeric.ok && max?.ok && numeric.value > max.value)
      errors.value = `The value is above max (${max.value}).`;
  }
  if (row.unit.length > 40) errors.unit = 'A unit is at most 40 characters.';
  if (row.description.length > 500) errors.description = 'A description is at most 500 characters.';
  return errors;
}

function valueProblem(text: string, otherNames: readonly string[]): string | null {
  if (text.trim() === '') return 'A value is needed: a number, or an expression of other parameters.';
  if (parseNumberText(text).ok) return null;
  const scope: ScopeName[] = otherNames.map((name) => ({ name, kind: 'parameter' }));
  const problems = expressionProblems(text, scope);
  return problems.length > 0 ? `Not a number, and not a valid expression: ${problems[0]!.message}` : null;
}

/**
 * The parameter a valid field contributes to the cell, or null when the field's text cannot be
 * stored (it stays in the row, with its error shown). Optional fields left blank are dropped.
 */
export function applyParamField(
  param: Parameter,
  field: ParamField,
  text: string,
  errors: ParamRowErrors,
): Parameter | null {
  if (errors[field] && field !== 'value') return null;
  const next: Parameter = { ...param };
  switch (field) {
    case 'name':
      next.name = text.trim();
      break;
    case 'value': {
      // An expression with a problem is still kept in the cell: the sheet checker marks it too,
      // and nothing typed is lost. A blank value is not stored.
      if (text.trim() === '') return null;
      const numeric = parseNumberText(text);
      next.value = numeric.ok ? numeric.value : text.trim();
      break;
    }
    case 'min':
    case 'max': {
      const numeric = parseNumberText(text);
      if (numeric.ok) next[field] = numeric.value;
      else delete next[field];
      if (text.trim() !== '' && !numeric.ok) return null;
      break;
    }
    case 'unit':
    case 'description':
      if (text.trim() === '') delete next[field];
      else next[field] = text;
      break;
  }
  return next;
}
