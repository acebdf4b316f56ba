import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import * as sheetsApi from '@/api/sheets';
import type { SimulationResult } from '@shared/engine/result';
import { useSheetEditorStore } from '@/stores/sheet-editor';
import { buttonNamed, cardOf, click, mountSheet, pondSheet, settle } from './harness';

const pool = vi.hoisted(() => ({
  stabilityBeforeRun: vi.fn(),
  simulate: vi.fn(),
  runStudy: vi.fn(),
  cancel: vi.fn(),
}));

vi.mock('@/api/sheets', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/sheets')>()),
  getSheet: vi.fn(),
  getVersion: vi.fn(),
  listVersions: vi.fn(),
}));
vi.mock('@/workers/pool', () => ({
  SimulationPool: class {
    simulate = pool.simulate;
    runStudy = pool.runStudy;
    cancel = pool.cancel;
    stabilityBeforeRun = pool.stabilityBeforeRun;
  },
}));

const api = vi.mocked(sheetsApi);
let wrapper: VueWrapper | undefined;

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
  api.getSheet.mockResolvedValue({
    id: 's1',
    title: 'Pond algae',
    owner: { id: 'u1', name: 'Mira Okafor' },
    version: 3,
    role: 'owner',
    forkSource: null,
    forkCount: 0,
    forkedFrom: null,
    forkedFromVersion: null,
    engineVersion: null,
    results: null,
    document: pondSheet(),
    digests: {},
    createdAt: new Date('2026-11-01T08:00:00Z'),
    updatedAt: new Date('2026-11-02T08:00:00Z'),
  });
});
afterEach(() => {
  wrapper?.unmount();
  wrapper = undefined;
  document.body.innerHTML = '';
});

function press(target: Element, init: KeyboardEventInit): void {
  target.dispatchEvent(new KeyboardEvent('keydown', { bubbles: true, cancelable: true, ...init }));
}

describe('keyboard shortcuts', () => {
  const altShift = (letter: string): KeyboardEventInit => ({
    key: letter,
    code: `Key${letter}`,
    altKey: true,
    shiftKey: true,
  });

  it('Alt+Shift+N and Alt+Shift+P move focus between cells', async () => {
    ({ wrapper } = await mountSheet());
    cardOf('params-main').focus();
    press(document.activeElement!, altShift('N'));
    expect(document.activeElement).toBe(cardOf('model-algae'));
    press(document.activeElement!, altShift('P'));
    press(document.activeElement!, altShift('P'));
    expect(document.activeElement).toBe(cardOf('note-intro'));
  });

  it('Alt+Shift+R runs the focused cell and keeps focus on it', async () => {
    pool.simulate.mockResolvedValue({ digest: '99', paths: 400 } as unknown as SimulationResult);
    ({ wrapper } = await mountSheet());
    cardOf('simulation-season').focus();
    press(document.activeElement!, altShift('R'));
    await settle();
    expect(pool.simulate).toHaveBeenCalledTimes(1);
    expect(document.activeElement).toBe(cardOf('simulation-season'));
  });

  it('runs nothing on Enter with Ctrl, ⌘ or Shift', async () => {
    ({ wrapper } = await mountSheet());
    cardOf('simulation-season').focus();
    for (const modifier of ['ctrlKey', 'metaKey', 'shiftKey'])
      press(document.activeElement!, { key: 'Enter', [modifier]: true });
    await settle();
    expect(pool.simulate).not.toHaveBeenCalled();
    expect(document.activeElement).toBe(cardOf('simulation-season'));
  });

  it('Alt+Shift+K shows the keys', async () => {
    ({ wrapper } = await mountSheet());
    press(document.body, altShift('K'));
    await settle();
    expect(document.body.textContent).toContain('Alt + Shift + R');
  });

  it("Ctrl+S opens the save dialog instead of the browser's", async () => {
    ({ wrapper } = await mountSheet());
    const event = new KeyboardEvent('keydown', { key: 's', ctrlKey: true, bubbles: true, cancelable: true });
    document.body.dispatchEvent(event);
    await settle();
    expect(event.defaultPrevented).toBe(true);
    expect(document.querySelector('input[aria-label="Message"]')).not.toBeNull();
  });

  it('lists the shortcuts in the help panel', async () => {
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Keyboard shortcuts'));
    const text = document.body.textContent ?? '';
    for (const keys of ['Alt + Shift + R', 'Alt + Shift + N', 'Alt + Shift + P', 'Ctrl/⌘ + S'])
      expect(text).toContain(keys);
    expect(text).not.toMatch(/Enter/);
  });
});

describe('older versions', () => {
  it('lists versions in the drawer and opens one read-only at ?version=N', async () => {
    api.listVersions.mockResolvedValue([
      {
        number: 2,
        message: 'more paths',
        author: { id: 'u1', name: 'Mira Okafor' },
        parent: 1,
        createdAt: new Date('2026-11-02T07:00:00Z'),
      },
      {
        number: 3,
        message: 'wetter summer',
        author: { id: 'u2', name: 'Jonas Pell' },
        parent: 2,
        createdAt: new Date('2026-11-02T08:00:00Z'),
      },
    ]);
    const oldDocument = { ...pondSheet(), title: 'Pond algae (first try)' };
    api.getVersion.mockResolvedValue({
      number: 2,
      message: 'more paths',
      author: { id: 'u1', name: 'Mira Okafor' },
      parent: 1,
      createdAt: new Date('2026-11-02T07:00:00Z'),
      document: oldDocument,
      digests: {},
      moments: {},
      engineVersion: null,
      results: null,
    });
    const mounted = await mountSheet();
    wrapper = mounted.wrapper;
    await click(buttonNamed('Versions'));
    const items = [...document.querySelectorAll('ol[aria-label="Saved versions"] li')].map(
      (li) => li.textContent ?? '',
    );
    expect(items).toHaveLength(2);
    expect(items[0]).toContain('Version 3');
    expect(items[0]).toContain('wetter summer');
    expect(items[0]).toContain('Jonas Pell');
    await click(buttonNamed('Open version 2'));
    expect(mounted.router.currentRoute.value.fullPath).toBe('/sheets/s1?version=2');
    expect(api.getVersion).toHaveBeenCalledWith('s1', 2);
    expect(document.body.textContent).toContain('You are reading version 2');
    expect(document.querySelector('h1')?.textContent).toBe('Pond algae (first try)');
    // Read-only: no editing controls and no draft.
    expect(document.querySelector('[aria-label="Delete model cell"]')).toBeNull();
    expect(document.querySelector('[aria-label="Add cell"]')).toBeNull();
    expect([...document.querySelectorAll('button')].some((b) => b.textContent?.trim() === 'Run all')).toBe(
      false,
    );
    expect(useSheetEditorStore().readonly).toBe(true);
  });
});
