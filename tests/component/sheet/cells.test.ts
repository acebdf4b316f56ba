import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import * as sheetsApi from '@/api/sheets';
import { checkSheet, sheetDocumentSchema, type SheetDocument } from '@shared/sheet';
import { useSheetEditorStore } from '@/stores/sheet-editor';
import { buttonNamed, cardOf, click, mountSheet, pondSheet, settle, shownCellIds } from './harness';

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
let wrapper: VueWrapper | undefined;

function serve(document: SheetDocument): void {
  api.getSheet.mockResolvedValue({
    id: 's1',
    title: document.title,
    owner: { id: 'u1', name: 'Mira Okafor' },
    version: 2,
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
    updatedAt: new Date('2026-11-02T08:00:00Z'),
  });
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

async function addFromEndMenu(label: string): Promise<void> {
  await click(buttonNamed('Add cell'));
  const item = [...document.querySelectorAll<HTMLButtonElement>('[role="menuitem"]')].find(
    (b) => b.textContent?.trim() === label,
  );
  expect(item, `menu item ${label}`).toBeDefined();
  expect(item!.disabled).toBe(false);
  await click(item!);
}

describe('adding cells from the "Add cell" menu', () => {
  it('adds one cell of each kind, with defaults that reference the model and simulation above', async () => {
    serve({ schemaVersion: 1, title: 'Blank', cells: [] });
    ({ wrapper } = await mountSheet());
    expect(document.body.textContent).toContain('This sheet has no cells yet');

    const labels = ['Note', 'Parameters', 'Model', 'Simulation', 'Chart', 'Probe', 'Step-size study'];
    for (const label of labels) await addFromEndMenu(label);

    const ids = shownCellIds();
    expect(ids.map((id) => id.split('-')[0])).toEqual([
      'note',
      'params',
      'model',
      'simulation',
      'chart',
      'probe',
      'study',
    ]);
    expect(new Set(ids).size).toBe(7);
    const doc = useSheetEditorStore().document!;
    // The defaults form a sheet that validates and that the checker finds nothing wrong with.
    expect(sheetDocumentSchema.safeParse(doc).success).toBe(true);
    expect(checkSheet(doc)).toEqual([]);
    const simulation = doc.cells[3]!;
    expect(simulation.kind === 'simulation' && simulation.model).toBe(ids[2]);
    for (const reader of doc.cells.slice(4)) {
      expect('simulation' in reader && reader.simulation).toBe(ids[3]);
    }
    // Every card got the stub editor of its kind.
    expect([...document.querySelectorAll('.stub-editor')].map((el) => el.getAttribute('data-kind'))).toEqual([
      'note',
      'params',
      'model',
      'simulation',
      'chart',
      'probe',
      'study',
    ]);
  });

  it('offers the kinds that read other cells only once there is something for them to read', async () => {
    serve({ schemaVersion: 1, title: 'Blank', cells: [] });
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Add cell'));
    const disabled = [...document.querySelectorAll<HTMLButtonElement>('[role="menuitem"]')]
      .filter((b) => b.disabled)
      .map((b) => b.textContent?.trim());
    expect(disabled).toEqual([
      'Simulation',
      'Chart',
      'Probe',
      'Step-size study',
      'Data',
      'Fit',
      'Scenarios',
      'Sweep',
    ]);
  });

  it('inserts at the place of the "Add cell" button that was used', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Add cell before cell 2'));
    const note = [...document.querySelectorAll<HTMLButtonElement>('[role="menuitem"]')].find(
      (b) => b.textContent?.trim() === 'Note',
    )!;
    await click(note);
    const ids = shownCellIds();
    expect(ids[0]).toBe('note-intro');
    expect(ids[1]).toMatch(/^note-[0-9a-f]{8}$/);
    expect(ids[2]).toBe('params-main');
  });
});

describe('moving, duplicating and deleting cells', () => {
  it('moves a cell up and down with the card buttons', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Move model cell up'));
    expect(shownCellIds().slice(0, 3)).toEqual(['note-intro', 'model-algae', 'params-main']);
    await click(buttonNamed('Move model cell down'));
    expect(shownCellIds().slice(0, 3)).toEqual(['note-intro', 'params-main', 'model-algae']);
    expect((buttonNamed('Move note cell up') as HTMLButtonElement).disabled).toBe(true);
    expect((buttonNamed('Move probe cell down') as HTMLButtonElement).disabled).toBe(true);
  });

  it('duplicates a cell below the original with a new id and the same content', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Duplicate simulation cell'));
    const ids = shownCellIds();
    expect(ids).toHaveLength(6);
    expect(ids[3]).toBe('simulation-season');
    expect(ids[4]).toMatch(/^simulation-[0-9a-f]{8}$/);
    const doc = useSheetEditorStore().document!;
    const { id: _copyId, ...copy } = doc.cells[4]!;
    const { id: _originalId, ...original } = doc.cells[3]!;
    expect(copy).toEqual(original);
  });

  it('deletes a cell and puts it back in its place with Undo', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    const before = shownCellIds();
    await click(buttonNamed('Delete parameters cell'));
    expect(shownCellIds()).toEqual(before.filter((id) => id !== 'params-main'));
    expect(document.body.textContent).toContain('Deleted the parameters cell.');
    expect(document.body.textContent).toContain('Unsaved changes');
    await click(buttonNamed('Undo'));
    expect(shownCellIds()).toEqual(before);
    expect(useSheetEditorStore().document).toEqual(pondSheet());
    expect(document.body.textContent).not.toContain('Deleted the parameters cell.');
    // Back to the saved document: nothing unsaved, no draft left behind.
    expect(document.body.textContent).not.toContain('Unsaved changes');
    expect(localStorage.getItem('meander:draft:u1:s1')).toBeNull();
  });

  it('names each card button after the kind of its cell', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    const labels = [...cardOf('model-algae').querySelectorAll('button')].map((b) =>
      b.getAttribute('aria-label'),
    );
    expect(labels).toEqual([
      'Edit model cell',
      'Run model cell',
      'Comments on model cell: 0 open',
      'Move model cell up',
      'Move model cell down',
      'Duplicate model cell',
      'Delete model cell',
    ]);
    expect(cardOf('note-intro').querySelector('[aria-label="Run note cell"]')).toBeNull();
  });
});

describe('reading and editing a card', () => {
  it('shows each cell of an opened sheet in its reading view, with a labelled Edit toggle', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    for (const id of shownCellIds()) {
      expect(cardOf(id).querySelector('.stub-reading')).not.toBeNull();
      expect(cardOf(id).querySelector('.stub-editor')).toBeNull();
    }
    const toggle = buttonNamed('Edit model cell', cardOf('model-algae'));
    expect(toggle.getAttribute('aria-pressed')).toBe('false');
    expect(toggle.getAttribute('aria-controls')).toBe(cardOf('model-algae').querySelector('.cell-body')!.id);
  });

  it('opens and closes the editor of one card with its Edit toggle', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    const toggle = buttonNamed('Edit model cell', cardOf('model-algae'));
    await click(toggle);
    expect(cardOf('model-algae').querySelector('.stub-editor')?.textContent).toBe(
      'model editor of model-algae',
    );
    expect(toggle.getAttribute('aria-pressed')).toBe('true');
    expect(cardOf('params-main').querySelector('.stub-reading')).not.toBeNull();
    await click(toggle);
    expect(cardOf('model-algae').querySelector('.stub-editor')).toBeNull();
    expect(cardOf('model-algae').querySelector('.stub-reading')).not.toBeNull();
  });

  it('opens a new cell in its editor', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    await addFromEndMenu('Note');
    const id = shownCellIds().at(-1)!;
    expect(cardOf(id).querySelector('.stub-editor')).not.toBeNull();
    expect(buttonNamed('Edit note cell', cardOf(id)).getAttribute('aria-pressed')).toBe('true');
  });

  it('toggles the editor of the cell with focus with Alt+Shift+O and keeps focus on the card', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    cardOf('simulation-season').focus();
    document.activeElement!.dispatchEvent(
      new KeyboardEvent('keydown', { key: 'O', code: 'KeyO', altKey: true, shiftKey: true, bubbles: true }),
    );
    await settle();
    expect(cardOf('simulation-season').querySelector('.stub-editor')).not.toBeNull();
    expect(document.activeElement).toBe(cardOf('simulation-season'));
  });

  it('lists the cells in an outline whose links move focus to the card', async () => {
    serve(pondSheet());
    ({ wrapper } = await mountSheet());
    const nav = document.querySelector('nav[aria-label="Outline of the sheet"]')!;
    const links = [...nav.querySelectorAll('a')];
    expect(links.map((a) => a.getAttribute('href'))).toEqual(shownCellIds().map((id) => `#cell-${id}`));
    await click(links[2]!);
    expect(document.activeElement).toBe(cardOf('model-algae'));
  });
});
