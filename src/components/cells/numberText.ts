/** Parsing what people type into number fields, without losing the text when it is not a number. */

export type ParsedNumber = { ok: true; value: number } | { ok: false; message: string };

/** A finite number written in plain or exponent notation ("2.5", "-1e-3"). */
const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

export function parseNumberText(text: string, what = 'this'): ParsedNumber {
  const trimmed = text.trim();
  if (trimmed === '') return { ok: false, message: `${capitalise(what)} needs a number.` };
  if (!NUMBER_PATTERN.test(trimmed))
    return { ok: false, message: `"${trimmed}" is not a number (write e.g. 0.25 or 1e-3).` };
  const value = Number(trimmed);
  if (!Number.isFinite(value)) return { ok: false, message: `"${trimmed}" is too large.` };
  return { ok: true, value };
}

export interface IntegerRange {
  min: number;
  max: number;
}

/** A whole number within a range, with the range in the message when it is outside. */
export function parseIntegerText(text: string, what: string, range: IntegerRange): ParsedNumber {
  const parsed = parseNumberText(text, what);
  if (!parsed.ok) return parsed;
  if (!Number.isInteger(parsed.value))
    return { ok: false, message: `${capitalise(what)} must be a whole number.` };
  if (parsed.value < range.min || parsed.value > range.max) {
    return {
      ok: false,
      message: `${capitalise(what)} must be between ${range.min.toLocaleString('en')} and ${range.max.toLocaleString('en')}.`,
    };
  }
  return parsed;
}

/** Text form of an optional number as a field shows it. */
export function numberToText(value: number | undefined | null): string {
  return value === undefined || value === null ? '' : String(value);
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
