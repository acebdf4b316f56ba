import { Router } from 'express';
import { createCommentsRepository } from '../comments/comments.repository';
import { commentsRoutes, sheetCommentsRoutes } from '../comments/comments.routes';
import { createCommentsUsecases } from '../comments/comments.usecases';
import { createDatasetsRepository } from '../datasets/datasets.repository';
import { datasetsRoutes, sheetDatasetsRoutes } from '../datasets/datasets.routes';
import { createDatasetsUsecases } from '../datasets/datasets.usecases';
import type { Db, DbExecutor } from '../db/client';
import { sheetFilesRoutes } from '../sheet-files/sheet-files.routes';
import { createSheetFilesUsecases } from '../sheet-files/sheet-files.usecases';
import { createTransact } from '../db/transact';
import type { Mailer } from '../mail/mailer';
import { createSharesRepository } from '../shares/shares.repository';
import { invitationsRoutes, sheetSharesRoutes } from '../shares/shares.routes';
import { createSharesUsecases } from '../shares/shares.usecases';
import { createUsersRepository } from '../users/users.repository';
import { createForksUsecases } from './forks.usecases';
import { createNotify } from './notify';
import { createSheetsRepository } from './sheets.repository';
import { sheetsRoutes } from './sheets.routes';
import { createSheetsUsecases, type SheetRepositories } from './sheets.usecases';

/** Every repository the sheet features use, bound to the database or to one transaction. */
export function createSheetRepositories(executor: DbExecutor): SheetRepositories {
  return {
    sheets: createSheetsRepository({ db: executor }),
    shares: createSharesRepository({ db: executor }),
    comments: createCommentsRepository({ db: executor }),
    users: createUsersRepository({ db: executor }),
  };
}

export interface SheetFeatureDeps {
  db: Db;
  mailer: Mailer;
  /** Where failures of mail sent after a response go. */
  report: (error: unknown) => void;
  now?: () => Date;
}

/** The usecases of sheets, shares, comments and forks (the app and the demo seed use these). */
export function createSheetFeatures({ db, mailer, report, now }: SheetFeatureDeps) {
  const repositories = createSheetRepositories(db);
  const transact = createTransact(db, createSheetRepositories);
  const notify = createNotify({ mailer, report });
  const sheets = createSheetsUsecases({ sheets: repositories.sheets, transact, now });
  return {
    sheets,
    forks: createForksUsecases({ sheets: repositories.sheets, sheetUsecases: sheets }),
    shares: createSharesUsecases({ repositories, transact, notify, now }),
    comments: createCommentsUsecases({ repositories, notify, now }),
    datasets: createDatasetsUsecases({
      datasets: createDatasetsRepository({ db }),
      sheets: repositories.sheets,
    }),
    sheetFiles: createSheetFilesUsecases({
      repositories: { sheets: repositories.sheets, datasets: createDatasetsRepository({ db }) },
      transact: createTransact(db, (tx) => ({
        sheets: createSheetsRepository({ db: tx }),
        datasets: createDatasetsRepository({ db: tx }),
      })),
      now,
    }),
  };
}

export type SheetFeatures = ReturnType<typeof createSheetFeatures>;

/** The API routes of sheets and what hangs off them, to mount under /api (see route-rights.ts). */
export function sheetFeatureRoutes(features: SheetFeatures, { appOrigin }: { appOrigin?: string }): Router {
  const router = Router();
  // Before the sheet routes, so that /import is not read as a sheet id.
  router.use('/sheets', sheetFilesRoutes(features));
  router.use('/sheets', sheetsRoutes(features));
  router.use('/sheets', sheetSharesRoutes({ shares: features.shares, appOrigin }));
  router.use('/sheets', sheetCommentsRoutes({ comments: features.comments, appOrigin }));
  router.use('/sheets', sheetDatasetsRoutes(features));
  router.use('/comments', commentsRoutes(features));
  router.use('/datasets', datasetsRoutes(features));
  router.use('/invitations', invitationsRoutes(features));
  return router;
}
