import { Router } from 'express';
import { versionNumberSchema } from '@shared/api/sheets';
import { currentUser, requireSignedIn } from '../auth/session-middleware';
import { receiveFile } from '../http/file-upload';
import { versionNotFound } from '../sheets/sheets.errors';
import { parseSheetId } from '../sheets/sheets.routes';
import { noSheetFile, SHEET_FILE_MAX_BYTES, sheetFileTooLarge } from './sheet-files.errors';
import type { SheetFilesUsecases } from './sheet-files.usecases';

function parseVersionNumber(value: unknown): number {
  const parsed = versionNumberSchema.safeParse(Number(value));
  if (!parsed.success) throw versionNotFound();
  return parsed.data;
}

/** GET /api/sheets/:id/versions/:number/file and POST /api/sheets/import (under /api/sheets). */
export function sheetFilesRoutes({ sheetFiles }: { sheetFiles: SheetFilesUsecases }): Router {
  const router = Router();
  router.use(requireSignedIn());

  router.get('/:id/versions/:number/file', async (req, res) => {
    const file = await sheetFiles.exportVersion(
      currentUser(res),
      parseSheetId(req.params.id),
      parseVersionNumber(req.params.number),
    );
    const slug =
      file.document.title
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-|-$/g, '') || 'sheet';
    res.setHeader(
      'Content-Disposition',
      `attachment; filename="${slug}-v${file.source?.version ?? 1}.meander.json"`,
    );
    res.json(file);
  });

  router.post('/import', async (req, res) => {
    const file = await receiveFile(req, res, {
      maxBytes: SHEET_FILE_MAX_BYTES,
      tooLarge: sheetFileTooLarge,
      noFile: noSheetFile,
    });
    res.status(201).json(await sheetFiles.importFile(currentUser(res), new Uint8Array(file.buffer)));
  });

  return router;
}
