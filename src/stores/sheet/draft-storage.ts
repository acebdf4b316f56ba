import { sheetDocumentSchema, type SheetDocument } from '@shared/sheet/document';

/**
 * Local drafts of a sheet in localStorage, one per (user, sheet), plus a recovery copy kept when
 * someone else's version replaces yours after a save conflict. Small, synchronous, and forgiving:
 * a full or missing storage never breaks editing, and an unreadable entry is ignored.
 */

export interface SheetDraft {
  document: SheetDocument;
  /** The server version the edits started from. */
  baseVersion: number;
  savedAt: Date;
}

export type DraftSlot = 'draft' | 'recovery';

export function draftKey(slot: DraftSlot, userId: string, sheetId: string): string {
  return `meander:${slot}:${userId}:${sheetId}`;
}

function storage(): Storage | null {
  try {
    return globalThis.localStorage ?? null;
  } catch {
    return null;
  }
}

/** Writes the draft; returns false when the browser refuses (private mode, quota). */
export function writeDraft(slot: DraftSlot, userId: string, sheetId: string, draft: SheetDraft): boolean {
  const store = storage();
  if (!store) return false;
  try {
    store.setItem(
      draftKey(slot, userId, sheetId),
      JSON.stringify({
        document: draft.document,
        baseVersion: draft.baseVersion,
        savedAt: draft.savedAt.toISOString(),
      }),
    );
    return true;
  } catch {
    return false;
  }
}

export function readDraft(slot: DraftSlot, userId: string, sheetId: string): SheetDraft | null {
  const text = storage()?.getItem(draftKey(slot, userId, sheetId));
  if (!text) return null;
  try {
    const raw = JSON.parse(text) as { document?: unknown; baseVersion?: unknown; savedAt?: unknown };
    // A draft may hold a half-edited, invalid document: keep it as it is, only check its frame.
    const frame = sheetDocumentSchema.pick({ schemaVersion: true }).safeParse(raw.document);
    const savedAt = new Date(String(raw.savedAt));
    const cells = (raw.document as { cells?: unknown } | undefined)?.cells;
    if (
      !frame.success ||
      !Array.isArray(cells) ||
      typeof raw.baseVersion !== 'number' ||
      Number.isNaN(savedAt.getTime())
    ) {
      return null;
    }
    return { document: raw.document as SheetDocument, baseVersion: raw.baseVersion, savedAt };
  } catch {
    return null;
  }
}

export function clearDraft(slot: DraftSlot, userId: string, sheetId: string): void {
  try {
    storage()?.removeItem(draftKey(slot, userId, sheetId));
  } catch {
    // Nothing to do: a storage that cannot remove cannot have stored either.
  }
}
