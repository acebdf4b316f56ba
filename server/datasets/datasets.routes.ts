import { type Request, type Response, Router } from 'express';
import multer from 'multer';
import { DATASET_LIMITS, datasetIdSchema, uploadDatasetFieldsSchema } from '@shared/api/datasets';
import { currentUser, requireSignedIn } from '../auth/session-middleware';
import { parseOr400 } from '../http/validate';
import { parseSheetId } from '../sheets/sheets.routes';
import { datasetNotFound, fileTooLarge, noFile } from './datasets.errors';
import type { DatasetsUsecases } from './datasets.usecases';

/** The one multipart route (the JSON-only rule in server/http/request-shape.ts lets it through). */
export const isDatasetUpload = (method: string, path: string): boolean =>
  method === 'POST' && /^\/sheets\/[^/]+\/datasets$/.test(path);

function parseDatasetId(value: unknown): string {
  const parsed = datasetIdSchema.safeParse(value);
  if (!parsed.success) throw datasetNotFound();
  return parsed.data;
}

/**
 * One file in field `file`, held in memory (never written to disk), a few short text fields.
 * Multer stops reading at the limit; its errors become ours (413 with the limit, else 400).
 */
const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: DATASET_LIMITS.maxBytes, files: 1, fields: 8, fieldSize: 1024, parts: 10 },
}).single('file');

function receiveFile(req: Request, res: Response): Promise<void> {
  return new Promise((resolve, reject) => {
    upload(req, res, (error: unknown) => {
      if (!error) resolve();
      else if (error instanceof multer.MulterError && error.code === 'LIMIT_FILE_SIZE')
        reject(fileTooLarge());
      else if (error instanceof multer.MulterError && error.code === 'LIMIT_UNEXPECTED_FILE')
        reject(noFile());
      else reject(error);
    });
  });
}

/** POST /api/sheets/:id/datasets (mounted beside the sheet routes). */
export function sheetDatasetsRoutes({ datasets }: { datasets: DatasetsUsecases }): Router {
  const router = Router();
  router.use(requireSignedIn());
  router.post('/:id/datasets', async (req, res) => {
    const sheetId = parseSheetId(req.params.id);
    // Rights first: a stranger learns nothing and nobody's file is read for nothing.
    await datasets.mayUpload(currentUser(res), sheetId);
    await receiveFile(req, res);
    const fields = parseOr400(uploadDatasetFieldsSchema, { ...req.body });
    if (!req.file) throw noFile();
    const summary = await datasets.upload(
      currentUser(res),
      sheetId,
      { bytes: new Uint8Array(req.file.buffer), originalName: req.file.originalname },
      fields,
    );
    res.status(201).json(summary);
  });
  return router;
}

/** GET /api/datasets/:id (the parsed table) and /api/datasets/:id/csv (the file as uploaded). */
export function datasetsRoutes({ datasets }: { datasets: DatasetsUsecases }): Router {
  const router = Router();
  router.use(requireSignedIn());
  router.get('/:id', async (req, res) => {
    res.json(await datasets.getTable(currentUser(res), parseDatasetId(req.params.id)));
  });
  router.get('/:id/csv', async (req, res) => {
    const file = await datasets.getFile(currentUser(res), parseDatasetId(req.params.id));
    const safeName = file.originalName.replace(/[^\w.-]+/g, '_') || 'dataset.csv';
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${safeName}"`);
    res.send(file.content);
  });
  return router;
}
