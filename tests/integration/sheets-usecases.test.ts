import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { connectDatabase, type Database, type DbExecutor } from '../../server/db/client';
import { createSheetsRepository, type SheetsRepository } from '../../server/sheets/sheets.repository';
import { createSheetsUsecases } from '../../server/sheets/sheets.usecases';
import { createUsersRepository } from '../../server/users/users.repository';
import { createTestDatabase, uniqueEmail } from './helpers';

let testDb: Awaited<ReturnType<typeof createTestDatabase>>;
let database: Database;
let authorId: string;

beforeAll(async () => {
  testDb = await createTestDatabase();
  database = connectDatabase(testDb.url, { max: 3 });
  authorId = 'usecaseauthor01';
  await createUsersRepository({ db: database.db }).insert({
    id: authorId,
    email: uniqueEmail('usecases'),
    name: 'Odile Ferrant',
    passwordHash: 'not-a-real-hash',
    role: 'member',
  });
});
afterAll(async () => {
  await database.close();
  await testDb.drop();
});

/** A real repository whose writes are also written down, to see which repository did them. */
function recordingRepository(executor: DbExecutor, label: string, writes: string[]): SheetsRepository {
  const real = createSheetsRepository({ db: executor });
  return {
    ...real,
    insertSheet: (sheet) => {
      writes.push(`${label}.insertSheet`);
      return real.insertSheet(sheet);
    },
    insertVersion: (version) => {
      writes.push(`${label}.insertVersion`);
      return real.insertVersion(version);
    },
    advance: (id, change) => {
      writes.push(`${label}.advance`);
      return real.advance(id, change);
    },
  };
}

describe('sheet usecases write through the repositories they are given', () => {
  function usecasesRecording(writes: string[]) {
    const db = database.db;
    return createSheetsUsecases({
      sheets: recordingRepository(db, 'injected', writes),
      transact: (work) =>
        db.transaction((tx) => work({ sheets: recordingRepository(tx, 'transaction', writes) })),
    });
  }

  it('creates a sheet through the transaction-scoped repository it was given', async () => {
    const writes: string[] = [];
    await usecasesRecording(writes).createSheet({ id: authorId }, { title: 'Injected writes' });
    expect(writes).toEqual(['transaction.insertSheet', 'transaction.insertVersion']);
  });

  it('saves a version through the transaction-scoped repository it was given', async () => {
    const writes: string[] = [];
    const usecases = usecasesRecording(writes);
    const created = await usecases.createSheet({ id: authorId }, { title: 'Injected save' });
    writes.length = 0;
    await usecases.saveVersion({ id: authorId }, created.id, {
      baseVersion: 1,
      message: 'second',
      document: { schemaVersion: 1, title: 'Injected save', cells: [] },
    });
    expect(writes).toEqual(['transaction.insertVersion', 'transaction.advance']);
  });
});
