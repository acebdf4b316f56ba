import { reactive } from 'vue';
import type { z } from 'zod';

/** The schemas' messages are written lower-case for reuse inside sentences; a field shows a sentence. */
export function asSentence(message: string): string {
  const text = message.trim();
  if (text === '') return text;
  const capitalised = text.charAt(0).toUpperCase() + text.slice(1);
  return /[.!?]$/.test(capitalised) ? capitalised : `${capitalised}.`;
}

/**
 * Checks a form against a shared zod schema before anything is sent, and keeps one message per
 * field (the first issue). `validate` returns the parsed values, or null with `errors` filled.
 */
export function useFormValidation<S extends z.ZodType<Record<string, unknown>>>(schema: S) {
  const errors = reactive<Record<string, string>>({});

  function clearErrors(): void {
    for (const key of Object.keys(errors)) delete errors[key];
  }

  function validate(values: z.input<S>): z.infer<S> | null {
    clearErrors();
    const result = schema.safeParse(values);
    if (result.success) return result.data;
    for (const issue of result.error.issues) {
      const field = String(issue.path[0] ?? 'form');
      if (!(field in errors)) errors[field] = asSentence(issue.message);
    }
    return null;
  }

  function setError(field: string, message: string): void {
    errors[field] = asSentence(message);
  }

  function clearError(field: string): void {
    delete errors[field];
  }

  return { errors, validate, setError, clearError, clearErrors };
}
