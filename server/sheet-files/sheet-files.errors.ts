import { AppError } from '../http/app-error';

export const SHEET_FILE_ERROR_CODES = {
  invalid: 'sheet_files.invalid',
  tooLarge: 'sheet_files.too_large',
  noFile: 'sheet_files.no_file',
  datasetMissing: 'sheet_files.dataset_missing',
} as const;

/** The maximum size of an imported sheet file (its datasets are inside it). */
export const SHEET_FILE_MAX_BYTES = 30 * 1024 * 1024;

/** The first fault of an imported file, with its path inside the file; nothing was created. */
export const invalidSheetFile = (path: (string | number)[], message: string) =>
  new AppError(
    400,
    SHEET_FILE_ERROR_CODES.invalid,
    `${path.length > 0 ? `${path.join('.')}: ` : ''}${message}; no sheet was created.`,
    { path },
  );

export const sheetFileTooLarge = () =>
  new AppError(
    413,
    SHEET_FILE_ERROR_CODES.tooLarge,
    `The sheet file is larger than ${SHEET_FILE_MAX_BYTES / (1024 * 1024)} MB; no sheet was created.`,
    { limit: SHEET_FILE_MAX_BYTES },
  );

export const noSheetFile = () =>
  new AppError(400, SHEET_FILE_ERROR_CODES.noFile, 'Send the sheet file in the form field "file".', {
    path: ['file'],
  });

export const datasetMissing = (cellId: string) =>
  new AppError(
    409,
    SHEET_FILE_ERROR_CODES.datasetMissing,
    `The data of cell "${cellId}" is not available to you, so the version cannot be exported with it.`,
    { cellId },
  );
