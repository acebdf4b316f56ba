import { Router } from 'express';
import { DATASET_LIMITS, datasetIdSchema, uploadDatasetFieldsSchema } from '@shared/api/datasets';
import { currentUser, requireSignedIn } from '../auth/session-middleware';
import { receiveFile } from '../http/file-upload';
import { parseOr400 } from '../http/validate';
import { parseSheetId } from '../sheets/sheets.routes';
import { datasetNotFound, fileTooLarge, noFile } from './datasets.errors';
import type { DatasetsUsecases } from './datasets.usecases';

function parseDatasetId(value: unknown): string {
  const parsed = datasetIdSchema.safeParse(value);
  if (!parsed.success) throw datasetNotFound();
  return parsed.data;
}

/** POST /api/sheets/:id/datasets (mounted beside the sheet routes). */
export function sheetDatasetsRoutes({ datasets }: { datasets: DatasetsUsecases }): Router {
  const router = Router();
  router.use(requireSignedIn());
  router.post('/:id/datasets', async (req, res) => {
    const sheetId = parseSheetId(req.params.id);
    // Rights first: a stranger learns nothing and nobody's file is read for nothing.
    await datasets.mayUpload(currentUser(res), sheetId);
    const file = await receiveFile(req, res, {
      maxBytes: DATASET_LIMITS.maxBytes,
      tooLarge: fileTooLarge,
      noFile,
    });
    const fields = parseOr400(uploadDatasetFieldsSchema, { ...req.body });
    const summary = await datasets.upload(
      currentUser(res),
      sheetId,
      { bytes: new Uint8Array(file.buffer), originalName: file.originalname },
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
