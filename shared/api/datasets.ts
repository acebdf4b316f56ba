import { z } from 'zod';

/**
 * Payloads of the dataset routes: POST /api/sheets/:id/datasets (multipart: the file in `file`,
 * optional `name`, `timeColumn`, `groupColumn`), GET /api/datasets/:id (the parsed table) and
 * GET /api/datasets/:id/csv (the file as uploaded). A dataset never changes once stored.
 */

/** Limits of one upload; over either one the server answers 413 and stores nothing. */
export const DATASET_LIMITS = {
  maxBytes: 10 * 1024 * 1024,
  maxRows: 200_000,
  maxColumns: 200,
  maxNameLength: 120,
} as const;

export const DATASET_ERROR_CODES = {
  badFile: 'datasets.bad_file',
  tooLarge: 'datasets.too_large',
  notFound: 'datasets.not_found',
  noFile: 'datasets.no_file',
} as const;

export const datasetIdSchema = z.string().regex(/^[a-z0-9]{1,64}$/, 'not a dataset id');

/** SHA-256 of the uploaded bytes, lower-case hex. */
export const checksumSchema = z.string().regex(/^[0-9a-f]{64}$/, 'a checksum is 64 hexadecimal digits');

/** A column is numeric when most of its filled cells are numbers; otherwise it holds labels. */
export const datasetColumnSchema = z.object({
  name: z.string(),
  type: z.enum(['number', 'text']),
});
export type DatasetColumn = z.infer<typeof datasetColumnSchema>;

/** One cell of a stored row: a number, a label, or null for an empty cell (a missing value). */
export const datasetValueSchema = z.union([z.number(), z.string(), z.null()]);
export type DatasetValue = z.infer<typeof datasetValueSchema>;

export const uploadDatasetFieldsSchema = z.object({
  name: z.string().trim().max(DATASET_LIMITS.maxNameLength).optional(),
  timeColumn: z.string().max(200).optional(),
  groupColumn: z.string().max(200).optional(),
});
export type UploadDatasetFields = z.infer<typeof uploadDatasetFieldsSchema>;

export const datasetSummarySchema = z.object({
  id: datasetIdSchema,
  name: z.string(),
  columns: z.array(datasetColumnSchema),
  rowCount: z.number().int(),
  checksum: checksumSchema,
});
export type DatasetSummary = z.infer<typeof datasetSummarySchema>;

export const datasetTableSchema = datasetSummarySchema.extend({
  sheetId: z.string(),
  originalName: z.string(),
  rows: z.array(z.array(datasetValueSchema)),
  createdAt: z.string(),
});
export type DatasetTable = z.infer<typeof datasetTableSchema>;
