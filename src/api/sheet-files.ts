import { createdSheetSchema, type CreatedSheet } from '@shared/api/sheets';
import { request } from './http';
import { parseAnswer } from './parse';

/** Sheet files: a version out as one JSON file, such a file in as a new sheet. */

export const sheetFileUrl = (sheetId: string, version: number) =>
  `/api/sheets/${encodeURIComponent(sheetId)}/versions/${version}/file`;

export async function importSheetFile(file: Blob, fileName: string): Promise<CreatedSheet> {
  const form = new FormData();
  form.append('file', file, fileName);
  return parseAnswer(
    createdSheetSchema,
    await request('/api/sheets/import', { method: 'POST', formData: form }),
    'the imported sheet',
  );
}
