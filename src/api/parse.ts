import type { z } from 'zod';
import { ApiError } from './http';

/**
 * Checks an answer against the shared payload schema, so a server and client out of step fail
 * here with a clear message instead of somewhere deep in a view.
 */
export function parseAnswer<S extends z.ZodType>(schema: S, raw: unknown, what: string): z.infer<S> {
  const result = schema.safeParse(raw);
  if (result.success) return result.data;
  const issue = result.error.issues[0];
  const where = issue && issue.path.length > 0 ? ` at ${issue.path.join('.')}` : '';
  throw new ApiError({
    status: 0,
    code: 'client.unexpected_answer',
    message: `The server's answer for ${what} is not what this page expects${where}: ${issue?.message ?? 'unknown shape'}. Reload the page; if it persists, the app may have been updated.`,
  });
}
