import type { z } from 'zod';
import { API_ERROR_CODES } from '@shared/api/errors';
import { refusalMessage, SHEET_FORBIDDEN, type SheetAction, type SheetRole } from '@shared/api/rights';
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

/** A caller who may read the sheet but whose role does not allow this action. */
export const sheetForbidden = (role: SheetRole, action: SheetAction) =>
  new AppError(403, SHEET_FORBIDDEN, refusalMessage(role, action), { role, action });

export const restoreCurrentVersion = () =>
  new AppError(400, 'sheets.restore_current', 'This is already the current version.');
