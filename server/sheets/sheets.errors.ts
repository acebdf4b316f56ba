import type { z } from 'zod';
import { API_ERROR_CODES } from '@shared/api/errors';
import { AppError } from '../http/app-error';

/** Also what a sheet the caller may not see answers: its existence is not revealed. */
export const sheetNotFound = () =>
  new AppError(404, API_ERROR_CODES.sheetNotFound, 'There is no such sheet, or it is not shared with you.');

export const versionNotFound = () =>
  new AppError(404, API_ERROR_CODES.versionNotFound, 'This sheet has no such version.');

export const versionConflict = (currentVersion: number) =>
  new AppError(
    409,
    API_ERROR_CODES.versionConflict,
    `Someone saved version ${currentVersion} while you were editing. Reload it, or fork your changes into a new sheet.`,
    { currentVersion },
  );

export const invalidDocument = (message: string, path: (string | number)[]) =>
  new AppError(400, API_ERROR_CODES.invalidDocument, message, { path });

/** The first issue of a document that failed the shared schema, with its path under `document`. */
export function invalidDocumentFrom(error: z.ZodError) {
  const issue = error.issues[0];
  const path = [
    'document',
    ...(issue?.path ?? []).map((key) => (typeof key === 'symbol' ? String(key) : key)),
  ];
  return invalidDocument(`${path.join('.')}: ${issue?.message ?? 'not a valid sheet document'}`, path);
}

/** A caller who may see the sheet but lacks the role for this action (once sheets are shared). */
export const sheetForbidden = (needed: string) =>
  new AppError(403, API_ERROR_CODES.forbidden, `This needs the ${needed} role on the sheet.`);
