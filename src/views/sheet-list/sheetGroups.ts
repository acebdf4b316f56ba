import type { SheetSummary } from '@/api/sheets';

/** How the sheet list is ordered: by last change (newest first) or by title (A to Z). */
export const SHEET_SORTS = [
  { value: 'updated', label: 'Last change' },
  { value: 'title', label: 'Title' },
] as const;
export type SheetSort = (typeof SHEET_SORTS)[number]['value'];

export interface SheetGroups {
  mine: SheetSummary[];
  shared: SheetSummary[];
}

const titleOrder = new Intl.Collator(undefined, { sensitivity: 'base', numeric: true });

/** Matches the words of `query` (any order, any case) against the title and the owner's name. */
function matches(sheet: SheetSummary, words: string[]): boolean {
  const text = `${sheet.title} ${sheet.owner.name}`.toLocaleLowerCase();
  return words.every((word) => text.includes(word));
}

/** The sheets the caller owns and those shared with them, filtered by `query` and sorted. */
export function groupSheets(sheets: readonly SheetSummary[], query: string, sort: SheetSort): SheetGroups {
  const words = query.toLocaleLowerCase().split(/\s+/).filter(Boolean);
  const shown = sheets.filter((sheet) => matches(sheet, words));
  shown.sort((a, b) =>
    sort === 'title'
      ? titleOrder.compare(a.title, b.title) || b.updatedAt.getTime() - a.updatedAt.getTime()
      : b.updatedAt.getTime() - a.updatedAt.getTime(),
  );
  return {
    mine: shown.filter((sheet) => sheet.role === 'owner'),
    shared: shown.filter((sheet) => sheet.role !== 'owner'),
  };
}
