import type { ErrorRequestHandler } from 'express';
import { isDatabaseUnavailable } from '../db/unavailable';
import { isAppError } from './app-error';
import {
  badJson,
  badRequest,
  badUrl,
  databaseUnavailable,
  internalError,
  payloadTooLarge,
  routeNotFound,
} from './http.errors';

export type ErrorReporter = (error: unknown) => void;

/**
 * The one place errors become responses. AppErrors keep their code and status; Express's own
 * errors (bad JSON, too large, a path that does not decode) get ours; an unreachable database is
 * a 503; anything else is a 500 that names no internals and is handed to the reporter.
 */
export function errorMiddleware(report: ErrorReporter): ErrorRequestHandler {
  return (error, _req, res, next) => {
    if (res.headersSent) {
      next(error);
      return;
    }
    const known = isAppError(error)
      ? error
      : (fromExpress(error) ?? (isDatabaseUnavailable(error) ? databaseUnavailable() : null));
    const appError = known ?? internalError();
    if (!known) report(error);
    for (const [name, value] of Object.entries(appError.headers)) res.setHeader(name, value);
    res.status(appError.status).json({
      error: { ...appError.details, code: appError.code, message: appError.message },
    });
  };
}

/** Errors Express's own middleware raises (body-parser, the router, serve-static) carry a client status. */
function fromExpress(error: unknown) {
  if (!error || typeof error !== 'object') return null;
  if ('type' in error && error.type === 'entity.parse.failed') return badJson();
  if ('type' in error && error.type === 'entity.too.large') return payloadTooLarge();
  if (error instanceof URIError) return badUrl();
  const status = 'status' in error && typeof error.status === 'number' ? error.status : 0;
  if (status === 404) return routeNotFound();
  if (status >= 400 && status < 500) {
    const exposed = 'expose' in error && error.expose === true && error instanceof Error;
    return badRequest(exposed ? error.message : 'The request is not valid.');
  }
  return null;
}
