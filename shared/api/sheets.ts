import { z } from 'zod';
import { ENGINE_VERSION } from '../engine/version';
import { cellIdSchema } from '../sheet/document';
import { SHEET_ROLES } from './rights';
import { versionResultsSchema } from '../run/version-results';

/**
 * Payloads of /api/sheets/*. The document itself is checked with `sheetDocumentSchema` by the
 * server (it answers 400 with the path of the first issue); here it is `unknown` so that a bad
 * document reaches that check instead of failing as a generic bad request.
 */

export const sheetTitleSchema = z
  .string()
  .trim()
  .min(1, 'a sheet needs a title')
  .max(200, 'a sheet title is at most 200 characters');

export const sheetIdSchema = z.string().regex(/^[a-z0-9]{1,64}$/, 'not a sheet id');

export const versionNumberSchema = z.number().int().min(1).max(2_147_483_647);

/** Where a sheet's document came from: a version of another sheet the caller can read. */
export const sheetLineageSchema = z.object({ sheetId: sheetIdSchema, version: versionNumberSchema });
export type SheetLineage = z.infer<typeof sheetLineageSchema>;

export const createSheetRequestSchema = z.object({
  title: sheetTitleSchema,
  document: z.unknown().optional(),
  /**
   * The sheet and version the document was copied from ("save mine as a new sheet" after a
   * conflict sends the sheet and its base version), stored as the new sheet's lineage.
   */
  forkedFrom: sheetLineageSchema.optional(),
});
export type CreateSheetRequest = z.infer<typeof createSheetRequestSchema>;

export const renameSheetRequestSchema = z.object({ title: sheetTitleSchema });
export type RenameSheetRequest = z.infer<typeof renameSheetRequestSchema>;

/** A run's digest per simulation cell id. */
export const versionDigestsSchema = z.record(cellIdSchema, z.string().min(1).max(200));
export type VersionDigests = z.infer<typeof versionDigestsSchema>;

/**
 * The final mean and variance of each state per simulation cell, over the paths not lost, saved
 * beside the digests: a rerun under another engine version compares these within their Monte
 * Carlo standard errors, since its digests cannot match.
 */
export const versionMomentsSchema = z
  .record(
    cellIdSchema,
    z.object({
      paths: z.number().int().min(0),
      final: z
        .record(
          z.string().max(64),
          z.object({ mean: z.number().nullable(), variance: z.number().nullable() }),
        )
        .refine((states) => Object.keys(states).length <= 16, 'a model has at most 16 state variables'),
    }),
  )
  .refine((cells) => Object.keys(cells).length <= 500, 'a sheet holds at most 500 cells');
export type VersionMoments = z.infer<typeof versionMomentsSchema>;

/** ENGINE_VERSION of the engine that made a version's digests (shared/engine/version.ts). */
export const engineVersionSchema = z
  .number()
  .int()
  .min(1)
  .max(ENGINE_VERSION, `this server knows engine versions 1 to ${ENGINE_VERSION}`);

export const saveVersionRequestSchema = z.object({
  baseVersion: z.number().int().min(1),
  message: z
    .string()
    .trim()
    .min(1, 'describe the version in a few words')
    .max(200, 'a version message is at most 200 characters'),
  document: z.unknown(),
  digests: versionDigestsSchema.optional(),
  /** Final moments of the same simulations as `digests`. */
  moments: versionMomentsSchema.optional(),
  /**
   * The engine version that made `digests`. A client that does not send it runs the engine
   * built with this server, so the server records its own ENGINE_VERSION.
   */
  engineVersion: engineVersionSchema.optional(),
  /** A compact summary of the results that match `document` (shared/run/version-results.ts). */
  results: versionResultsSchema.optional(),
});
export type SaveVersionRequest = z.infer<typeof saveVersionRequestSchema>;

export const createdSheetSchema = z.object({ id: z.string(), title: z.string(), version: z.number().int() });
export type CreatedSheet = z.infer<typeof createdSheetSchema>;

export const savedVersionSchema = z.object({ number: z.number().int() });
export type SavedVersion = z.infer<typeof savedVersionSchema>;

/**
 * Dates are ISO 8601 strings on the wire; the client's api/ functions turn them into Dates.
 */
const callerRoleSchema = z.enum(SHEET_ROLES);

export const sheetSummarySchema = z.object({
  id: z.string(),
  title: z.string(),
  /** The caller's role on the sheet. */
  role: callerRoleSchema,
  owner: z.object({ id: z.string(), name: z.string() }),
  version: z.number().int(),
  forkedFrom: z.string().nullable(),
  /** The version of `forkedFrom` this sheet was made from. */
  forkedFromVersion: z.number().int().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type SheetSummary = z.infer<typeof sheetSummarySchema>;

export const sheetListSchema = z.object({ sheets: z.array(sheetSummarySchema) });
export type SheetList = z.infer<typeof sheetListSchema>;

/** Where a fork came from; the title is the one of the version forked. */
export const forkSourceSchema = z.object({
  sheetId: z.string(),
  title: z.string(),
  version: z.number().int(),
  /** False once the source is deleted or no longer shared with the caller. */
  canRead: z.boolean(),
});
export type ForkSource = z.infer<typeof forkSourceSchema>;

/**
 * Results saved with a version; one that no longer reads (a summary from a newer server) is
 * dropped rather than keeping the version from opening.
 */
const savedResultsSchema = versionResultsSchema.nullable().catch(null).default(null);

export const sheetDetailSchema = z.object({
  id: z.string(),
  title: z.string(),
  owner: z.object({ id: z.string(), name: z.string() }),
  /** The caller's role on the sheet. */
  role: callerRoleSchema,
  forkSource: forkSourceSchema.nullable(),
  /** Forks of this sheet the caller can read. */
  forkCount: z.number().int(),
  version: z.number().int(),
  forkedFrom: z.string().nullable(),
  forkedFromVersion: z.number().int().nullable(),
  /** The current version's document (a SheetDocument). */
  document: z.unknown(),
  digests: versionDigestsSchema,
  /** The engine version that made `digests`; null when the version has none. */
  engineVersion: z.number().int().nullable(),
  /** The results saved with the current version, or null. */
  results: savedResultsSchema,
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type SheetDetail = z.infer<typeof sheetDetailSchema>;

export const versionSummarySchema = z.object({
  number: z.number().int(),
  message: z.string(),
  author: z.object({ id: z.string(), name: z.string() }),
  parent: z.number().int().nullable(),
  createdAt: z.string(),
});
export type VersionSummary = z.infer<typeof versionSummarySchema>;

export const versionListSchema = z.object({ versions: z.array(versionSummarySchema) });
export type VersionList = z.infer<typeof versionListSchema>;

export const versionDetailSchema = versionSummarySchema.extend({
  document: z.unknown(),
  digests: versionDigestsSchema,
  moments: versionMomentsSchema.default({}),
  /** The engine version that made `digests`; null when the version has none. */
  engineVersion: z.number().int().nullable(),
  /** The results saved with the version, or null when it was saved without them. */
  results: savedResultsSchema,
});
export type VersionDetail = z.infer<typeof versionDetailSchema>;

export const forkRequestSchema = z.object({
  /** The version to copy; the current one when omitted. */
  version: versionNumberSchema.optional(),
  title: sheetTitleSchema.optional(),
});
export type ForkRequest = z.infer<typeof forkRequestSchema>;

export const forkListSchema = z.object({ forks: z.array(sheetSummarySchema) });
export type ForkList = z.infer<typeof forkListSchema>;

/** GET /api/sheets/:id/head: cheap to poll; answers 304 to a matching If-None-Match. */
export const sheetHeadSchema = z.object({
  version: z.number().int(),
  title: z.string(),
  updatedAt: z.string(),
});
export type SheetHead = z.infer<typeof sheetHeadSchema>;
