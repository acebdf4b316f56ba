import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import * as authApi from '@/api/auth';
import * as sheetsApi from '@/api/sheets';
import { buttonByText, click, fillByLabel, mountAt } from './harness';

vi.mock('@/api/auth', () => ({ fetchCurrentUser: vi.fn(), signOut: vi.fn() }));
vi.mock('@/api/sheets', () => ({
  listSheets: vi.fn(),
  createSheet: vi.fn(),
  renameSheet: vi.fn(),
  deleteSheet: vi.fn(),
  getSheet: vi.fn(() => new Promise(() => undefined)),
}));
// The sheet page itself is another helper's; a stand-in keeps this test about the list.
vi.mock('@/views/SheetView.vue', () => ({ default: { name: 'SheetViewStub', render: () => null } }));

const auth = vi.mocked(authApi);
const api = vi.mocked(sheetsApi);
const owner = { id: 'u7', email: 'omar.field@example.test', name: 'Omar Field', role: 'member' as const };
const sheet = (
  id: string,
  title: string,
  version: number,
  shared?: { role: 'viewer' | 'commenter' | 'editor'; owner: string },
) => ({
  id,
  title,
  role: shared?.role ?? ('owner' as const),
  owner: shared ? { id: 'u9', name: shared.owner } : { id: owner.id, name: owner.name },
  version,
  forkedFrom: null,
  forkedFromVersion: null,
  createdAt: new Date('2026-03-01T09:00:00Z'),
  updatedAt: new Date('2026-03-02T10:30:00Z'),
});
let wrapper: VueWrapper | undefined;

beforeEach(() => {
  vi.clearAllMocks();
  auth.fetchCurrentUser.mockResolvedValue(owner);
});
afterEach(() => {
  wrapper?.unmount();
  document.body.innerHTML = '';
});

describe('sheet list', () => {
  it('says there are no sheets yet when the list is empty', async () => {
    api.listSheets.mockResolvedValue([]);
    ({ wrapper } = await mountAt('/sheets'));
    await vi.waitFor(() => expect(document.body.textContent).toContain('No sheets yet'));
    expect(document.querySelector('ul[aria-label="Your sheets"]')).toBeNull();
  });

  it('lists each sheet with its title, version and a link to open it', async () => {
    api.listSheets.mockResolvedValue([
      sheet('aq1', 'Aquifer recharge anomaly', 4),
      sheet('cp2', 'Copper price index', 1),
    ]);
    ({ wrapper } = await mountAt('/sheets'));
    await vi.waitFor(() =>
      expect(document.querySelectorAll('ul[aria-label="Your sheets"] li')).toHaveLength(2),
    );
    const rows = [...document.querySelectorAll('ul[aria-label="Your sheets"] li')];
    expect(rows[0]?.textContent).toContain('Aquifer recharge anomaly');
    expect(rows[0]?.textContent).toContain('version 4');
    expect(rows[0]?.querySelector('a')?.getAttribute('href')).toBe('/sheets/aq1');
    expect(rows[1]?.textContent).toContain('version 1');
    expect(document.body.textContent).not.toContain('No sheets yet');
  });

  it('creates a sheet from the title dialog and opens it', async () => {
    api.listSheets.mockResolvedValue([]);
    api.createSheet.mockResolvedValue({ id: 'nw3', title: 'Reservoir inflow', version: 1 });
    const mounted = await mountAt('/sheets');
    wrapper = mounted.wrapper;
    await vi.waitFor(() => expect(document.body.textContent).toContain('No sheets yet'));
    await click(buttonByText('New sheet'));
    await fillByLabel('Title', '  Reservoir inflow ');
    await click(buttonByText('Create'));
    expect(api.createSheet).toHaveBeenCalledWith({ title: 'Reservoir inflow' });
    await vi.waitFor(() => expect(mounted.router.currentRoute.value.fullPath).toBe('/sheets/nw3'), {
      timeout: 10_000,
    });
  });

  it('refuses an empty title without calling the server', async () => {
    api.listSheets.mockResolvedValue([]);
    ({ wrapper } = await mountAt('/sheets'));
    await vi.waitFor(() => expect(document.body.textContent).toContain('No sheets yet'));
    await click(buttonByText('New sheet'));
    await fillByLabel('Title', '   ');
    await click(buttonByText('Create'));
    expect(document.body.textContent).toContain('Enter a title.');
    expect(api.createSheet).not.toHaveBeenCalled();
  });

  it('deletes a sheet only after confirmation', async () => {
    api.listSheets.mockResolvedValue([sheet('aq1', 'Aquifer recharge anomaly', 4)]);
    api.deleteSheet.mockResolvedValue(undefined);
    ({ wrapper } = await mountAt('/sheets'));
    await vi.waitFor(() =>
      expect(document.querySelectorAll('ul[aria-label="Your sheets"] li')).toHaveLength(1),
    );
    await click(document.querySelector<HTMLElement>('button[aria-label="Delete Aquifer recharge anomaly"]')!);
    expect(api.deleteSheet).not.toHaveBeenCalled();
    expect(document.body.textContent).toContain('cannot be undone');
    await click(buttonByText('Delete'));
    expect(api.deleteSheet).toHaveBeenCalledWith('aq1');
    await vi.waitFor(() =>
      expect(document.querySelectorAll('ul[aria-label="Your sheets"] li')).toHaveLength(0),
    );
  });
  it('groups sheets into mine and shared with me, with the owner and role of shared ones', async () => {
    api.listSheets.mockResolvedValue([
      sheet('aq1', 'Aquifer recharge anomaly', 4),
      sheet('fs2', 'Harvested whitefish', 3, { role: 'commenter', owner: 'Lena Kowal' }),
    ]);
    ({ wrapper } = await mountAt('/sheets'));
    await vi.waitFor(() =>
      expect(document.querySelector('ul[aria-label="Sheets shared with you"]')).not.toBeNull(),
    );
    const mine = document.querySelector('ul[aria-label="Your sheets"]')!;
    const shared = document.querySelector('ul[aria-label="Sheets shared with you"]')!;
    expect(mine.textContent).toContain('Aquifer recharge anomaly');
    expect(mine.textContent).not.toContain('Harvested whitefish');
    expect(shared.textContent).toContain('Lena Kowal’s sheet');
    expect(shared.textContent).toContain('you are commenter');
    // A commenter may neither rename nor delete someone else's sheet.
    expect(shared.querySelector('button[aria-label="Delete Harvested whitefish"]')).toBeNull();
    expect(shared.querySelector('button[aria-label="Rename Harvested whitefish"]')).toBeNull();
  });

  it('filters both groups by the words searched, in title or owner', async () => {
    api.listSheets.mockResolvedValue([
      sheet('aq1', 'Aquifer recharge anomaly', 4),
      sheet('cp2', 'Copper price index', 1),
      sheet('fs2', 'Harvested whitefish', 3, { role: 'viewer', owner: 'Lena Kowal' }),
    ]);
    ({ wrapper } = await mountAt('/sheets'));
    await vi.waitFor(() =>
      expect(document.querySelectorAll('ul[aria-label="Your sheets"] li')).toHaveLength(2),
    );
    const search = document.querySelector<HTMLInputElement>('input[aria-label="Search sheets"]')!;
    search.value = 'kowal';
    search.dispatchEvent(new Event('input'));
    await vi.waitFor(() => expect(document.querySelector('ul[aria-label="Your sheets"]')).toBeNull());
    expect(document.querySelectorAll('ul[aria-label="Sheets shared with you"] li')).toHaveLength(1);
    search.value = 'price COPPER';
    search.dispatchEvent(new Event('input'));
    await vi.waitFor(() =>
      expect(document.querySelectorAll('ul[aria-label="Your sheets"] li')).toHaveLength(1),
    );
    expect(document.querySelector('ul[aria-label="Your sheets"]')!.textContent).toContain(
      'Copper price index',
    );
  });
});
