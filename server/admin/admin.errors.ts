import { API_ERROR_CODES } from '@shared/api/errors';
import { AppError } from '../http/app-error';

export const lastAdmin = () =>
  new AppError(409, API_ERROR_CODES.lastAdmin, 'This is the last admin; make someone else admin first.', {
    path: ['role'],
  });

export const userNotFound = () => new AppError(404, API_ERROR_CODES.userNotFound, 'There is no such user.');
