import type { ErrorRequestHandler } from 'express';
import { isAppError } from './app-error';
import { badJson, badRequest, internalError, payloadTooLarge, routeNotFound } from './http.errors';

export type ErrorReporter = (error: unknown) => void;

/**
 * The one place errors become responses. AppErrors keep their code and status; body-parser's
 * own errors (bad JSON, too large) get ours; anything else is a 500 that names no internals and
 * is handed to the reporter.
 */
export function errorMiddleware(report: ErrorReporter): ErrorRequestHandler {
  return (error, _req, res, next) => {
    if (res.headersSent) {
      next(error);
      return;
    }
    const known = isAppError(error) ? error : fromBodyParser(error);
    const appError = known ?? internalError();
    if (!known) report(error);
    for (const [name, value] of Object.entries(appError.headers)) res.setHeader(name, value);
    res.status(appError.status).json({
      error: { ...appError.details, code: appError.code, message: appError.message },
    });
  };
}

/** Errors Express's own middleware raises (body-parser, serve-static) carry a client status. */
function fromBodyParser(error: unknown) {
  if (!error || typeof error !== 'object') return null;
  if ('type' in error && error.type === 'entity.parse.failed') return badJson();
  if ('type' in error && error.type === 'entity.too.large') return payloadTooLarge();
  const status = 'status' in error && typeof error.status === 'number' ? error.status : 0;
  if (status === 404) return routeNotFound();
  if (status >= 400 && status < 500 && 'expose' in error && error.expose === true) {
    return badRequest(error instanceof Error ? error.message : 'The request is not valid.');
  }
  return null;
}
