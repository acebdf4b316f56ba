import { mayDo, type SheetAction, type SheetRole } from '@shared/api/rights';
import type { SheetRecord } from './sheets.repository';
import { sheetForbidden, sheetNotFound } from './sheets.errors';

/**
 * Applies the rights table (shared/api/rights.ts) to a caller and a sheet. Every sheet usecase
 * asks here. A caller with no role gets 404, as if the sheet did not exist (site admins too); one
 * who may read it but not do this gets 403 naming what their role allows.
 */

export interface SheetActor {
  id: string;
}

export interface SheetAccess {
  sheet: SheetRecord;
  role: SheetRole;
}

export function roleOn(
  sheet: Pick<SheetRecord, 'ownerId' | 'sharedRole'>,
  user: SheetActor,
): SheetRole | null {
  return sheet.ownerId === user.id ? 'owner' : sheet.sharedRole;
}

export function requireRight(
  sheet: SheetRecord | null,
  user: SheetActor,
  action: SheetAction,
  options: { isAuthor?: boolean } = {},
): SheetAccess {
  if (!sheet) throw sheetNotFound();
  const role = roleOn(sheet, user);
  if (!role) throw sheetNotFound();
  if (!mayDo(role, action, options.isAuthor)) throw sheetForbidden(role, action);
  return { sheet, role };
}
