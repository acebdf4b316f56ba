import { Router } from 'express';
import type { Db, DbExecutor } from '../db/client';
import { createTransact } from '../db/transact';
import { createSheetsRepository } from './sheets.repository';
import { sheetsRoutes } from './sheets.routes';
import { createSheetsUsecases, type SheetRepositories } from './sheets.usecases';

/** Every repository the sheet features use, bound to the database or to one transaction. */
export function createSheetRepositories(executor: DbExecutor): SheetRepositories {
  return { sheets: createSheetsRepository({ db: executor }) };
}

export interface SheetFeatureDeps {
  db: Db;
  now?: () => Date;
}

/** The usecases of sheets, built from their dependencies (the app and the demo seed use these). */
export function createSheetFeatures({ db, now }: SheetFeatureDeps) {
  const repositories = createSheetRepositories(db);
  const transact = createTransact(db, createSheetRepositories);
  return { sheets: createSheetsUsecases({ ...repositories, transact, now }) };
}

export type SheetFeatures = ReturnType<typeof createSheetFeatures>;

/** The API routes of sheets and what hangs off them, to mount under /api. */
export function sheetFeatureRoutes(features: SheetFeatures): Router {
  const router = Router();
  router.use('/sheets', sheetsRoutes({ sheets: features.sheets }));
  return router;
}
