import { API_ERROR_CODES } from '@shared/api/errors';
import { AppError } from '../http/app-error';

export const unauthenticated = () =>
  new AppError(401, API_ERROR_CODES.unauthenticated, 'Sign in to continue.');

/** One answer for an unknown e-mail and a wrong password, so neither reveals which accounts exist. */
export const badCredentials = () =>
  new AppError(401, API_ERROR_CODES.badCredentials, 'That e-mail and password do not match an account.');

/** Says when the lock ends, in minutes, and in Retry-After. */
export const rateLimited = (retryAfterSeconds: number, what = 'attempts') =>
  new AppError(
    429,
    API_ERROR_CODES.rateLimited,
    `Too many ${what}. Try again in ${Math.ceil(retryAfterSeconds / 60)} minute(s).`,
    { retryAfterSeconds },
    { 'Retry-After': String(retryAfterSeconds) },
  );

export const badResetToken = () =>
  new AppError(
    400,
    API_ERROR_CODES.badResetToken,
    'This reset link is invalid, expired or already used. Ask for a new one.',
    { path: ['token'] },
  );

export const badSignUpToken = () =>
  new AppError(
    400,
    API_ERROR_CODES.badSignUpToken,
    'This confirmation link is invalid, expired or already used. Sign up again, or sign in.',
    { path: ['token'] },
  );

export const wrongPassword = () =>
  new AppError(400, API_ERROR_CODES.wrongPassword, 'The current password is not correct.', {
    path: ['currentPassword'],
  });

export const forbidden = () =>
  new AppError(403, API_ERROR_CODES.forbidden, 'You do not have the rights for this.');
