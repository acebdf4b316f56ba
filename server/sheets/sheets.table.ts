import { sql } from 'drizzle-orm';
import {
  type AnyPgColumn,
  check,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
} from 'drizzle-orm/pg-core';
import type { VersionDigests, VersionMoments } from '@shared/api/sheets';
import type { VersionResults } from '@shared/run/version-results';
import { users } from '../users/users.table';

export const sheets = pgTable(
  'sheets',
  {
    id: text('id').primaryKey(),
    ownerId: text('owner_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    title: text('title').notNull(),
    /** Number of the newest version; versions are numbered 1, 2, 3 … per sheet. */
    currentVersion: integer('current_version').notNull().default(1),
    forkedFrom: text('forked_from').references((): AnyPgColumn => sheets.id, { onDelete: 'set null' }),
    /** The source's version the fork (or a "save mine as a new sheet" copy) was made from. */
    forkedFromVersion: integer('forked_from_version'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    /** Soft delete: versions stay for forks that point here; the sheet is gone for everyone. */
    deletedAt: timestamp('deleted_at', { withTimezone: true }),
  },
  (table) => [
    index('sheets_owner_updated_idx').on(table.ownerId, table.updatedAt),
    index('sheets_forked_from_idx').on(table.forkedFrom),
  ],
);

/** Immutable: rows are only ever inserted. */
export const sheetVersions = pgTable(
  'sheet_versions',
  {
    sheetId: text('sheet_id')
      .notNull()
      .references(() => sheets.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    /** A SheetDocument, validated with sheetDocumentSchema before it is written. */
    document: jsonb('document').notNull(),
    authorId: text('author_id')
      .notNull()
      .references(() => users.id),
    message: text('message').notNull(),
    /** The version this one was based on; null for the first. */
    parentNumber: integer('parent_number'),
    digests: jsonb('digests').$type<VersionDigests>().notNull().default({}),
    /** Final mean and variance per state of the simulations in `digests` (see versionMomentsSchema). */
    moments: jsonb('moments').$type<VersionMoments>().notNull().default({}),
    /**
     * ENGINE_VERSION of the engine that made the digests (shared/engine/version.ts); null exactly
     * when there are none. Digests compare bit for bit only under the same engine version.
     */
    engineVersion: integer('engine_version'),
    /**
     * A compact summary of the version's results (shared/run/version-results.ts), so an old
     * version opens with its numbers and charts; null when it was saved without one.
     */
    results: jsonb('results').$type<VersionResults>(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    primaryKey({ name: 'sheet_versions_sheet_number_pk', columns: [table.sheetId, table.number] }),
    check(
      'sheet_versions_digests_engine_version',
      sql`(${table.digests} = '{}'::jsonb) = (${table.engineVersion} is null)`,
    ),
  ],
);

export type SheetRow = typeof sheets.$inferSelect;
export type SheetVersionRow = typeof sheetVersions.$inferSelect;
