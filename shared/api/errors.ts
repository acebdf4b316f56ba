import { z } from 'zod';

/**
 * Every error the API sends has this shape. `code` is stable (`sheets.not_found`) and is what a
 * client branches on; `message` is for people; `path` points into the request body for
 * validation errors. Some codes carry extra fields (a version conflict sends `currentVersion`).
 */
export const apiErrorSchema = z.object({
  error: z
    .object({
      code: z.string(),
      message: z.string(),
      path: z.array(z.union([z.string(), z.number()])).optional(),
    })
    .loose(),
});

export type ApiError = z.infer<typeof apiErrorSchema>;

/** The codes a client may need to branch on; others exist and are shown by their message. */
export const API_ERROR_CODES = {
  badRequest: 'request.invalid',
  badJson: 'request.bad_json',
  tooLarge: 'request.too_large',
  notFound: 'request.not_found',
  internal: 'server.internal',
  unavailable: 'server.unavailable',
  unknownHost: 'request.unknown_host',
  badUrl: 'request.bad_url',
  badEncoding: 'request.bad_encoding',
  notJson: 'request.not_json',
  badOrigin: 'auth.bad_origin',
  unauthenticated: 'auth.unauthenticated',
  badCredentials: 'auth.bad_credentials',
  rateLimited: 'auth.rate_limited',
  badResetToken: 'auth.bad_reset_token',
  badSignUpToken: 'auth.bad_sign_up_token',
  wrongPassword: 'auth.wrong_password',
  forbidden: 'auth.forbidden',
  lastAdmin: 'admin.last_admin',
  userNotFound: 'admin.user_not_found',
  sheetNotFound: 'sheets.not_found',
  invalidDocument: 'sheets.invalid_document',
  versionNotFound: 'sheets.version_not_found',
  versionConflict: 'sheets.version_conflict',
} as const;

export type ApiErrorCode = (typeof API_ERROR_CODES)[keyof typeof API_ERROR_CODES];
