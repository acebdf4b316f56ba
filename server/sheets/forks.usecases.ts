import type { CreatedSheet, ForkList, ForkRequest } from '@shared/api/sheets';
import { requireRight, type SheetActor } from './sheet-rights';
import type { SheetsRepository } from './sheets.repository';
import { versionNotFound } from './sheets.errors';
import { toSheetSummary, type SheetsUsecases } from './sheets.usecases';

const forkTitle = (title: string) => `${title} (fork)`.slice(0, 200);

/** Forks: anyone who can read a sheet copies a version of it into a sheet of their own. */
export function createForksUsecases({
  sheets,
  sheetUsecases,
}: {
  sheets: SheetsRepository;
  sheetUsecases: Pick<SheetsUsecases, 'createSheet'>;
}) {
  return {
    /** Cell ids, digests, their moments and engine version are kept; the link back is stored. */
    async forkSheet(user: SheetActor, sheetId: string, input: ForkRequest): Promise<CreatedSheet> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'fork');
      const number = input.version ?? sheet.currentVersion;
      const version = await sheets.findVersion(sheet.id, number);
      if (!version) throw versionNotFound();
      return sheetUsecases.createSheet(user, {
        title: input.title ?? forkTitle(sheet.title),
        document: version.document,
        forkedFrom: { sheetId: sheet.id, version: number },
        digests: version.digests,
        moments: version.moments,
        engineVersion: version.engineVersion,
        results: version.results,
      });
    },

    /** Forks of a sheet that the caller can read (others' private forks stay unseen). */
    async listForks(user: SheetActor, sheetId: string): Promise<ForkList> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'read');
      const rows = await sheets.listForksForUser(sheet.id, user.id);
      return { forks: rows.map((row) => toSheetSummary(row, user)) };
    },
  };
}

export type ForksUsecases = ReturnType<typeof createForksUsecases>;
