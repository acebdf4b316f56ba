import type { z } from 'zod';
import { badRequest } from './http.errors';

/**
 * Parses a request part with its zod schema, once, at the edge. The first issue becomes a 400
 * with its path and message, so a form can point at the field.
 */
export function parseOr400<Schema extends z.ZodType>(
  schema: Schema,
  value: unknown,
  where?: string,
): z.infer<Schema> {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  throw zodIssueToBadRequest(result.error, where);
}

export function zodIssueToBadRequest(error: z.ZodError, where?: string) {
  const issue = error.issues[0];
  const path = (issue?.path ?? []).map((key) => (typeof key === 'symbol' ? String(key) : key));
  const location = path.length > 0 ? path.join('.') : where;
  const message = issue ? `${location ? `${location}: ` : ''}${issue.message}` : 'The request is not valid.';
  return badRequest(message, path);
}
