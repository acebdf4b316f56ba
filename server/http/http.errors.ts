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
