import type { Db, DbExecutor } from './client';

/**
 * Runs work in one transaction, handing it repositories bound to that transaction. Usecases take
 * one of these instead of the database, so the repositories a caller injects are the ones that
 * write, in a transaction or not.
 */
export type Transact<Repositories> = <T>(work: (repositories: Repositories) => Promise<T>) => Promise<T>;

export function createTransact<Repositories>(
  db: Db,
  repositoriesFor: (executor: DbExecutor) => Repositories,
): Transact<Repositories> {
  return (work) => db.transaction((tx) => work(repositoriesFor(tx)));
}
