import { z } from 'zod';
import { SHEET_SCHEMA_VERSION, sheetDocumentSchema, type SheetDocument } from './document';

/**
 * Old documents stay readable: each stored document carries its `schemaVersion`, and a reader
 * upgrades it one version at a time before validating it with today's schema. When the format
 * changes, raise SHEET_SCHEMA_VERSION and add the step from the old number to UPGRADES; never
 * edit a step once it has shipped (saved versions were written by it).
 */
export type DocumentUpgrade = (doc: Record<string, unknown>) => Record<string, unknown>;

/** UPGRADES[n] turns a version-n document into a version-(n + 1) document. */
const UPGRADES: Readonly<Record<number, DocumentUpgrade>> = {};

export interface UpgradeChain {
  /** The version documents are upgraded to. */
  target: number;
  steps: Readonly<Record<number, DocumentUpgrade>>;
}

const CURRENT_CHAIN: UpgradeChain = { target: SHEET_SCHEMA_VERSION, steps: UPGRADES };

export class DocumentVersionError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'DocumentVersionError';
  }
}

/**
 * The document upgraded to the chain's target version. Anything that is not an object with a
 * whole `schemaVersion` is returned as it is, for the schema to report. A version newer than the
 * target, or one with no upgrade step, throws a DocumentVersionError that says so.
 */
export function upgradeDocument(raw: unknown, chain: UpgradeChain = CURRENT_CHAIN): unknown {
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) return raw;
  let doc = raw as Record<string, unknown>;
  let version = doc.schemaVersion;
  if (typeof version !== 'number' || !Number.isInteger(version)) return raw;
  if (version > chain.target) {
    throw new DocumentVersionError(
      `this sheet was written in format ${version}, newer than this Meander reads (up to ${chain.target}); update Meander to open it`,
    );
  }
  while (version < chain.target) {
    const step = Object.hasOwn(chain.steps, version) ? chain.steps[version] : undefined;
    if (!step) throw new DocumentVersionError(`there is no upgrade from sheet format ${version}`);
    doc = { ...step(doc), schemaVersion: version + 1 };
    version += 1;
  }
  return doc;
}

/**
 * Upgrade, then validate with today's schema: what every reader of a stored or uploaded document
 * calls. A format this Meander cannot read fails on `schemaVersion` with the reason.
 */
export function parseSheetDocument(raw: unknown): ReturnType<typeof sheetDocumentSchema.safeParse> {
  let upgraded: unknown;
  try {
    upgraded = upgradeDocument(raw);
  } catch (error) {
    if (!(error instanceof DocumentVersionError)) throw error;
    return {
      success: false,
      error: new z.ZodError([
        { code: 'custom', path: ['schemaVersion'], message: error.message, input: raw },
      ]) as z.ZodError<SheetDocument>,
    };
  }
  return sheetDocumentSchema.safeParse(upgraded);
}
