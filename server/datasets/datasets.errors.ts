import { DATASET_ERROR_CODES, DATASET_LIMITS } from '@shared/api/datasets';
import type { TableFault } from '@shared/data/parse-table';
import { AppError } from '../http/app-error';

/** Also what a dataset of a sheet the caller cannot read answers. */
export const datasetNotFound = () =>
  new AppError(
    404,
    DATASET_ERROR_CODES.notFound,
    'There is no such dataset, or its sheet is not shared with you.',
  );

export const noFile = () =>
  new AppError(400, DATASET_ERROR_CODES.noFile, 'Send the file in the form field "file".', {
    path: ['file'],
  });

const megabytes = DATASET_LIMITS.maxBytes / (1024 * 1024);

export const fileTooLarge = () =>
  new AppError(
    413,
    DATASET_ERROR_CODES.tooLarge,
    `The file is larger than ${megabytes} MB, the limit for one dataset; nothing was stored.`,
    { limit: DATASET_LIMITS.maxBytes },
  );

/** A file the parser refused: 413 for the row and column limits, else 400 with row and column. */
export function badFile(fault: TableFault) {
  const tooLarge = fault.kind === 'too_many_rows' || fault.kind === 'too_many_columns';
  const details: Record<string, unknown> = { fault: fault.kind };
  if (fault.row !== undefined) details.row = fault.row;
  if (fault.column !== undefined) details.column = fault.column;
  if (tooLarge)
    details.limit = fault.kind === 'too_many_rows' ? DATASET_LIMITS.maxRows : DATASET_LIMITS.maxColumns;
  return new AppError(
    tooLarge ? 413 : 400,
    tooLarge ? DATASET_ERROR_CODES.tooLarge : DATASET_ERROR_CODES.badFile,
    `${fault.message}; nothing was stored.`,
    details,
  );
}
