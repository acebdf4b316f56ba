/**
 * An error with a stable code and an HTTP status, thrown from small factories in each feature's
 * `.errors.ts` and turned into `{ error: { code, message, path?, ...details } }` by one middleware.
 */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details: { path?: (string | number)[]; [key: string]: unknown } = {},
    /** Extra response headers (Retry-After on 429). */
    readonly headers: Record<string, string> = {},
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export function isAppError(error: unknown): error is AppError {
  return error instanceof AppError;
}
