import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import * as sheetsApi from '@/api/sheets';
import { ApiError } from '@/api/http';
import type { SheetDocument } from '@shared/sheet';
import { useSheetEditorStore } from '@/stores/sheet-editor';
import { buttonNamed, click, mountSheet, pondSheet, settle } from './harness';

vi.mock('@/api/sheets', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/sheets')>()),
  getSheet: vi.fn(),
  getVersion: vi.fn(),
  saveVersion: vi.fn(),
  createSheet: vi.fn(),
  renameSheet: vi.fn(),
  listVersions: vi.fn(),
}));
vi.mock('@/workers/pool', () => ({ SimulationPool: class {} }));

const api = vi.mocked(sheetsApi);
const DRAFT_KEY = 'meander:draft:u1:s1';
const RECOVERY_KEY = 'meander:recovery:u1:s1';
const SERVER_UPDATED = new Date('2026-11-02T08:00:00Z');
let wrapper: VueWrapper | undefined;

function serve(document: SheetDocument, version: number, updatedAt = SERVER_UPDATED): void {
  api.getSheet.mockResolvedValue({
    id: 's1',
    title: document.title,
    owner: { id: 'u1', name: 'Mira Okafor' },
    version,
    role: 'owner',
    forkSource: null,
    forkCount: 0,
    forkedFrom: null,
    forkedFromVersion: null,
    engineVersion: null,
    results: null,
    document,
    digests: {},
    createdAt: new Date('2026-11-01T08:00:00Z'),
    updatedAt,
  });
}

function storeDraft(document: SheetDocument, baseVersion: number, savedAt: Date): void {
  localStorage.setItem(DRAFT_KEY, JSON.stringify({ document, baseVersion, savedAt: savedAt.toISOString() }));
}

function titleInput(): HTMLInputElement {
  return document.querySelector<HTMLInputElement>('input[aria-label="Sheet title"]')!;
}

async function typeTitle(text: string): Promise<void> {
  const input = titleInput();
  input.value = text;
  input.dispatchEvent(new Event('input'));
  await settle();
}

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
});
afterEach(() => {
  wrapper?.unmount();
  wrapper = undefined;
  document.body.innerHTML = '';
});

describe('local drafts', () => {
  it('writes every edit to a draft with the version it started from', async () => {
    serve(pondSheet(), 3);
    ({ wrapper } = await mountSheet());
    expect(document.body.textContent).not.toContain('Unsaved changes');
    await typeTitle('Pond algae, wet summer');
    const draft = JSON.parse(localStorage.getItem(DRAFT_KEY)!);
    expect(draft.baseVersion).toBe(3);
    expect(draft.document.title).toBe('Pond algae, wet summer');
    expect(document.body.textContent).toContain('Unsaved changes');
  });

  it('restores a draft newer than the server version with a notice, and "Discard draft" drops it', async () => {
    serve(pondSheet(), 3);
    const edited = { ...pondSheet(), title: 'Pond algae, drought year' };
    storeDraft(edited, 3, new Date('2026-11-03T09:30:00Z'));
    ({ wrapper } = await mountSheet());
    expect(titleInput().value).toBe('Pond algae, drought year');
    expect(document.body.textContent).toContain('Restored your unsaved changes from');
    expect(document.body.textContent).toContain('Unsaved changes');

    await click(buttonNamed('Discard draft'));
    expect(titleInput().value).toBe('Pond algae');
    expect(localStorage.getItem(DRAFT_KEY)).toBeNull();
    expect(document.body.textContent).not.toContain('Restored your unsaved changes');
  });

  it('keeps a draft the server has moved past as a local copy instead of applying it', async () => {
    serve(pondSheet(), 5, new Date('2026-11-04T10:00:00Z'));
    storeDraft({ ...pondSheet(), title: 'An old idea' }, 3, new Date('2026-11-03T09:30:00Z'));
    ({ wrapper } = await mountSheet());
    expect(titleInput().value).toBe('Pond algae');
    expect(JSON.parse(localStorage.getItem(RECOVERY_KEY)!).document.title).toBe('An old idea');
    await click(buttonNamed('Keep my changes on top of version 5'));
    expect(titleInput().value).toBe('An old idea');
    expect(useSheetEditorStore().baseVersion).toBe(5);
  });
});

describe('a draft older than the newest version', () => {
  it('is offered, never applied, even when it was written after the newest version', async () => {
    // Version 5 was saved before this draft was last written (another person, another clock).
    serve(pondSheet(), 5, new Date('2026-11-02T08:00:00Z'));
    const older = { ...pondSheet(), title: 'An old idea' };
    storeDraft(older, 3, new Date('2026-11-03T09:30:00Z'));
    ({ wrapper } = await mountSheet());
    expect(titleInput().value).toBe('Pond algae');
    expect(document.body.textContent).toMatch(/based on version 3.*the newest is version 5/);
    expect(useSheetEditorStore().baseVersion).toBe(5);
  });

  it('compares the draft with the newest version, cell by cell', async () => {
    serve(pondSheet(), 5, new Date('2026-11-04T10:00:00Z'));
    const older = pondSheet();
    const simulation = older.cells[3]!;
    if (simulation.kind !== 'simulation') throw new Error('fixture');
    simulation.paths = 800;
    storeDraft(older, 3, new Date('2026-11-03T09:30:00Z'));
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Compare with version 5'));
    const list = document.querySelector('[aria-label="Changes in your draft"]');
    expect(list?.textContent).toMatch(/Simulation/);
    expect(list?.textContent).toMatch(/paths/);
    expect(list?.textContent).toMatch(/800/);
  });

  it('can be kept on top of the newest version or discarded', async () => {
    serve(pondSheet(), 5, new Date('2026-11-04T10:00:00Z'));
    storeDraft({ ...pondSheet(), title: 'An old idea' }, 3, new Date('2026-11-03T09:30:00Z'));
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Discard my draft'));
    expect(titleInput().value).toBe('Pond algae');
    expect(localStorage.getItem(RECOVERY_KEY)).toBeNull();
    expect(document.body.textContent).not.toContain('based on version 3');
  });

  it('shows in the header the version the draft is based on and the newest one', async () => {
    serve(pondSheet(), 5, new Date('2026-11-04T10:00:00Z'));
    storeDraft({ ...pondSheet(), title: 'An old idea' }, 3, new Date('2026-11-03T09:30:00Z'));
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Keep my changes on top of version 5'));
    const header = document.querySelector('header.sheet-header')!.textContent!;
    expect(header).toMatch(/draft based on version 5/);
    expect(header).toMatch(/newest version 5/);
  });
});

describe('saving a version', () => {
  async function saveWithMessage(message: string): Promise<void> {
    await click(buttonNamed('Save version'));
    const field = document.querySelector<HTMLInputElement>('input[aria-label="Message"]')!;
    field.value = message;
    field.dispatchEvent(new Event('input'));
    await settle();
    await click(buttonNamed('Save'));
  }

  it('saves against the base version, clears the draft and shows the new number', async () => {
    serve(pondSheet(), 3);
    api.saveVersion.mockResolvedValue({ number: 4 });
    api.renameSheet.mockResolvedValue(undefined);
    ({ wrapper } = await mountSheet());
    await typeTitle('Pond algae, wet summer');
    await saveWithMessage('wetter summer');
    expect(api.saveVersion).toHaveBeenCalledWith('s1', {
      baseVersion: 3,
      message: 'wetter summer',
      document: { ...pondSheet(), title: 'Pond algae, wet summer' },
      digests: {},
    });
    // The save itself sets the sheet's title on the server: no second request.
    expect(api.renameSheet).not.toHaveBeenCalled();
    expect(useSheetEditorStore().serverTitle).toBe('Pond algae, wet summer');
    expect(localStorage.getItem(DRAFT_KEY)).toBeNull();
    expect(document.body.textContent).toContain('version 4');
    expect(document.body.textContent).not.toContain('Unsaved changes');
  });

  it('refuses an empty message without calling the server', async () => {
    serve(pondSheet(), 3);
    ({ wrapper } = await mountSheet());
    await typeTitle('Pond algae, wet summer');
    await saveWithMessage('   ');
    expect(api.saveVersion).not.toHaveBeenCalled();
    expect(document.body.textContent).toContain('Describe the version in a few words.');
  });

  describe('when someone saved first (409)', () => {
    beforeEach(() => {
      api.saveVersion.mockRejectedValue(
        new ApiError({
          status: 409,
          code: 'sheets.version_conflict',
          message: 'version 4 was saved first',
          details: { currentVersion: 4 },
        }),
      );
    });

    it('explains the conflict, offers both choices and keeps the draft', async () => {
      serve(pondSheet(), 3);
      ({ wrapper } = await mountSheet());
      await typeTitle('Pond algae, my edit');
      await saveWithMessage('my edit');
      expect(document.body.textContent).toContain('someone saved version 4 first');
      expect(buttonNamed('Load their version')).toBeTruthy();
      expect(buttonNamed('Save mine as a new sheet')).toBeTruthy();
      expect(JSON.parse(localStorage.getItem(DRAFT_KEY)!).document.title).toBe('Pond algae, my edit');
    });

    it('"Load their version" opens theirs and keeps mine as a copy that can be restored', async () => {
      serve(pondSheet(), 3);
      ({ wrapper } = await mountSheet());
      await typeTitle('Pond algae, my edit');
      await saveWithMessage('my edit');
      serve({ ...pondSheet(), title: 'Pond algae, their edit' }, 4, new Date('2026-11-05T10:00:00Z'));
      await click(buttonNamed('Load their version'));
      expect(titleInput().value).toBe('Pond algae, their edit');
      expect(document.body.textContent).toContain('version 4');
      expect(JSON.parse(localStorage.getItem(RECOVERY_KEY)!).document.title).toBe('Pond algae, my edit');
      await click(buttonNamed('Keep my changes on top of version 4'));
      expect(titleInput().value).toBe('Pond algae, my edit');
      expect(useSheetEditorStore().baseVersion).toBe(4);
    });

    it('"Save mine as a new sheet" creates a sheet with my document and opens it', async () => {
      serve(pondSheet(), 3);
      api.createSheet.mockResolvedValue({ id: 's2', title: 'Pond algae, my edit (my copy)', version: 1 });
      const mounted = await mountSheet();
      wrapper = mounted.wrapper;
      await typeTitle('Pond algae, my edit');
      await saveWithMessage('my edit');
      serve({ ...pondSheet(), title: 'Pond algae, my edit (my copy)' }, 1);
      await click(buttonNamed('Save mine as a new sheet'));
      expect(api.createSheet).toHaveBeenCalledTimes(1);
      const body = api.createSheet.mock.calls[0]![0];
      expect(body.document?.cells).toEqual(pondSheet().cells);
      expect(body.title).toBe('Pond algae, my edit (my copy)');
      // The copy keeps its lineage: the sheet and the version the edits started from.
      expect(body.forkedFrom).toEqual({ sheetId: 's1', version: 3 });
      expect(mounted.router.currentRoute.value.path).toBe('/sheets/s2');
    });
  });
});
