import { describe, expect, it } from 'vitest';
import { groupSheets } from '@/views/sheet-list/sheetGroups';
import type { SheetSummary } from '@/api/sheets';

const sheet = (title: string, updated: string, role: SheetSummary['role'] = 'owner'): SheetSummary => ({
  id: title.toLowerCase().replace(/\W+/g, ''),
  title,
  role,
  owner: { id: role === 'owner' ? 'me' : 'u2', name: role === 'owner' ? 'Mira Okafor' : 'Lena Kowal' },
  version: 1,
  forkedFrom: null,
  forkedFromVersion: null,
  createdAt: new Date('2026-01-01T00:00:00Z'),
  updatedAt: new Date(updated),
});

const list = [
  sheet('beta reservoir', '2026-02-01T00:00:00Z'),
  sheet('Alpha lake', '2026-01-01T00:00:00Z'),
  sheet('Gamma estuary', '2026-03-01T00:00:00Z', 'editor'),
];

describe('groupSheets', () => {
  it('orders by last change, newest first, by default', () => {
    const groups = groupSheets(list, '', 'updated');
    expect(groups.mine.map((s) => s.title)).toEqual(['beta reservoir', 'Alpha lake']);
    expect(groups.shared.map((s) => s.title)).toEqual(['Gamma estuary']);
  });

  it('orders by title whatever the case', () => {
    expect(groupSheets(list, '', 'title').mine.map((s) => s.title)).toEqual(['Alpha lake', 'beta reservoir']);
  });

  it('keeps only sheets whose title or owner holds every word searched', () => {
    expect(groupSheets(list, 'LAKE', 'updated').mine.map((s) => s.title)).toEqual(['Alpha lake']);
    expect(groupSheets(list, 'kowal estuary', 'updated').shared).toHaveLength(1);
    expect(groupSheets(list, 'kowal lake', 'updated')).toEqual({ mine: [], shared: [] });
  });
});
