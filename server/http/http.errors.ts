import { API_ERROR_CODES } from '@shared/api/errors';
import { AppError } from './app-error';

export const badRequest = (message: string, path?: (string | number)[]) =>
  new AppError(400, API_ERROR_CODES.badRequest, message, path ? { path } : {});

export const badJson = () =>
  new AppError(400, API_ERROR_CODES.badJson, 'The request body is not valid JSON.');

export const payloadTooLarge = () =>
  new AppError(413, API_ERROR_CODES.tooLarge, 'The request body is too large (the limit is 2 MB).');

export const routeNotFound = () =>
  new AppError(404, API_ERROR_CODES.notFound, 'There is nothing at this address.');

export const internalError = () =>
  new AppError(
    500,
    API_ERROR_CODES.internal,
    'Something went wrong on the server; nothing was changed by this request.',
  );

export const badOrigin = () =>
  new AppError(
    403,
    API_ERROR_CODES.badOrigin,
    'This request did not come from a Meander page (bad or missing Origin).',
  );

/** RFC 9110 §15.5.20: 421 Misdirected Request, the request reached a server that does not serve that host. */
export const unknownHost = () =>
  new AppError(
    421,
    API_ERROR_CODES.unknownHost,
    'This server does not answer to that host name. Open Meander at its configured address (APP_ORIGIN).',
  );

export const badUrl = () =>
  new AppError(400, API_ERROR_CODES.badUrl, 'The address is not valid (malformed percent-encoding).');

export const badEncoding = () =>
  new AppError(400, API_ERROR_CODES.badEncoding, 'The request body is not valid UTF-8.');

export const notJson = () =>
  new AppError(
    415,
    API_ERROR_CODES.notJson,
    'This endpoint reads JSON: send JSON (Content-Type: application/json).',
  );

export const databaseUnavailable = () =>
  new AppError(
    503,
    API_ERROR_CODES.unavailable,
    'The database is not reachable right now; nothing was changed. Try again in a moment.',
    {},
    { 'Retry-After': '5' },
  );
