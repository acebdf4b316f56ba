import type { z } from 'zod';

/**
 * Limits read from the zod schema that defines a field, so a form never keeps a second copy of
 * them: the range of a number, the longest text. Optional and defaulted fields are unwrapped.
 */
function unwrapped(schema: z.ZodType): z.ZodType {
  let inner = schema as z.ZodType & { unwrap?: () => z.ZodType };
  while (typeof inner.unwrap === 'function') inner = inner.unwrap() as typeof inner;
  return inner;
}

export function numberRange(schema: z.ZodType): { min: number; max: number } {
  const number = unwrapped(schema) as z.ZodNumber;
  return {
    min: number.minValue ?? Number.NEGATIVE_INFINITY,
    max: number.maxValue ?? Number.POSITIVE_INFINITY,
  };
}

export function maxLength(schema: z.ZodType): number {
  return (unwrapped(schema) as z.ZodString).maxLength ?? Number.POSITIVE_INFINITY;
}

/** "A name is at most 80 characters." when the text is longer than the schema allows. */
export function lengthCheck(schema: z.ZodType, what: string) {
  const limit = maxLength(schema);
  return (text: string): string | null =>
    text.length > limit ? `${what} is at most ${limit} characters.` : null;
}
