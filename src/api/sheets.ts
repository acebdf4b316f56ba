import {
  createdSheetSchema,
  forkListSchema,
  savedVersionSchema,
  sheetHeadSchema,
  sheetDetailSchema,
  sheetListSchema,
  versionDetailSchema,
  versionListSchema,
  type CreatedSheet,
  type SavedVersion,
  type SheetDetail as SheetDetailWire,
  type SheetSummary as SheetSummaryWire,
  type VersionDetail as VersionDetailWire,
  type VersionDigests,
  type VersionMoments,
  type VersionSummary as VersionSummaryWire,
} from '@shared/api/sheets';
import { API_ERROR_CODES } from '@shared/api/errors';
import type { SheetDocument, SheetDocumentInput } from '@shared/sheet/document';
import { parseSheetDocument } from '@shared/sheet/upgrade';
import type { VersionResults } from '@shared/run/version-results';
import { ApiError, request, requestIfChanged, toDate } from './http';
import { parseAnswer } from './parse';

/** Sheets and their versions. Dates arrive as ISO strings and leave here as `Date`s. */

export type { CreatedSheet, SavedVersion, VersionDigests } from '@shared/api/sheets';

export type SheetSummary = Omit<SheetSummaryWire, 'createdAt' | 'updatedAt'> & {
  createdAt: Date;
  updatedAt: Date;
};
export type SheetDetail = Omit<SheetDetailWire, 'document' | 'createdAt' | 'updatedAt'> & {
  document: SheetDocument;
  createdAt: Date;
  updatedAt: Date;
};
export type VersionSummary = Omit<VersionSummaryWire, 'createdAt'> & { createdAt: Date };
export type VersionDetail = Omit<VersionDetailWire, 'document' | 'createdAt'> & {
  document: SheetDocument;
  createdAt: Date;
};

export interface SaveVersionBody {
  /** The version the edits started from; a newer current version answers 409. */
  baseVersion: number;
  message: string;
  document: SheetDocument;
  /** Digest of each simulation cell's current output, by cell id. */
  digests?: VersionDigests;
  /** Final mean and variance per state of the same simulations. */
  moments?: VersionMoments;
  /** The engine version that made the digests. */
  engineVersion?: number;
  /** A compact summary of the results that match the document. */
  results?: VersionResults;
}

const sheetPath = (id: string): string => `/api/sheets/${encodeURIComponent(id)}`;

/** A stored document that no longer matches the schema is reported, not half-shown. */
function readDocument(raw: unknown, what: string): SheetDocument {
  const result = parseSheetDocument(raw);
  if (result.success) return result.data;
  const issue = result.error.issues[0];
  throw new ApiError({
    status: 0,
    code: 'sheets.unreadable_document',
    message: `The document of ${what} cannot be read${issue ? ` (${issue.path.join('.') || 'document'}: ${issue.message})` : ''}.`,
  });
}

/** The signed-in user's sheets, newest first. */
export async function listSheets(): Promise<SheetSummary[]> {
  const answer = parseAnswer(sheetListSchema, await request('/api/sheets'), 'the sheet list');
  return answer.sheets.map((sheet) => ({
    ...sheet,
    createdAt: toDate(sheet.createdAt),
    updatedAt: toDate(sheet.updatedAt),
  }));
}

/** Creates a sheet at version 1; without a document the server starts an empty one. */
export async function createSheet(body: {
  title: string;
  document?: SheetDocumentInput;
  /** The sheet and version the document was copied from. */
  forkedFrom?: { sheetId: string; version: number };
}): Promise<CreatedSheet> {
  return parseAnswer(
    createdSheetSchema,
    await request('/api/sheets', { method: 'POST', body }),
    'the new sheet',
  );
}

export async function getSheet(id: string): Promise<SheetDetail> {
  const answer = parseAnswer(sheetDetailSchema, await request(sheetPath(id)), 'the sheet');
  return {
    ...answer,
    document: readDocument(answer.document, `sheet "${answer.title}"`),
    createdAt: toDate(answer.createdAt),
    updatedAt: toDate(answer.updatedAt),
  };
}

export async function renameSheet(id: string, title: string): Promise<void> {
  await request(sheetPath(id), { method: 'PATCH', body: { title } });
}

export async function deleteSheet(id: string): Promise<void> {
  await request(sheetPath(id), { method: 'DELETE' });
}

/**
 * Saves a new version. A stale `baseVersion` throws an ApiError with code
 * `sheets.version_conflict`; read the winner's number with `versionConflict(error)`.
 */
export async function saveVersion(id: string, body: SaveVersionBody): Promise<SavedVersion> {
  const raw = await request(`${sheetPath(id)}/versions`, { method: 'POST', body });
  return parseAnswer(savedVersionSchema, raw, 'the saved version');
}

/** Versions of a sheet (as the server orders them), without their documents. */
export async function listVersions(id: string): Promise<VersionSummary[]> {
  const answer = parseAnswer(
    versionListSchema,
    await request(`${sheetPath(id)}/versions`),
    'the version list',
  );
  return answer.versions.map((version) => ({ ...version, createdAt: toDate(version.createdAt) }));
}

export async function getVersion(id: string, number: number): Promise<VersionDetail> {
  const answer = parseAnswer(
    versionDetailSchema,
    await request(`${sheetPath(id)}/versions/${number}`),
    `version ${number}`,
  );
  return {
    ...answer,
    document: readDocument(answer.document, `version ${number}`),
    createdAt: toDate(answer.createdAt),
  };
}

/** The current version number when `error` is a save conflict (409), else null. */
export function versionConflict(error: unknown): number | null {
  if (!(error instanceof ApiError) || error.code !== API_ERROR_CODES.versionConflict) return null;
  const current = error.details.currentVersion;
  return typeof current === 'number' ? current : null;
}

/** Saves an old version's document as a new current version; returns its number. */
export async function restoreVersion(id: string, number: number): Promise<number> {
  const raw = await request(`${sheetPath(id)}/versions/${number}/restore`, { method: 'POST' });
  return parseAnswer(savedVersionSchema, raw, 'the restored version').number;
}

/** Copies a version (the current one when omitted) into a new sheet the caller owns. */
export async function forkSheet(
  id: string,
  body: { version?: number; title?: string } = {},
): Promise<CreatedSheet> {
  const raw = await request(`${sheetPath(id)}/forks`, { method: 'POST', body });
  return parseAnswer(createdSheetSchema, raw, 'the fork');
}

/** Forks of a sheet that the caller can read. */
export async function listForks(id: string): Promise<SheetSummary[]> {
  const answer = parseAnswer(forkListSchema, await request(`${sheetPath(id)}/forks`), 'the forks');
  return answer.forks.map((sheet) => ({
    ...sheet,
    createdAt: toDate(sheet.createdAt),
    updatedAt: toDate(sheet.updatedAt),
  }));
}

export interface SheetHead {
  version: number;
  title: string;
  updatedAt: Date;
}

/**
 * The sheet's newest version, cheaply: with the `etag` of the last answer, `null` while nothing
 * changed (the server answers 304 without a body).
 */
export async function getHead(
  id: string,
  etag: string | null,
): Promise<{ head: SheetHead; etag: string | null } | null> {
  const answer = await requestIfChanged(`${sheetPath(id)}/head`, etag);
  if (answer === null) return null;
  const head = parseAnswer(sheetHeadSchema, answer.body, 'the sheet head');
  return { head: { ...head, updatedAt: toDate(head.updatedAt) }, etag: answer.etag };
}
