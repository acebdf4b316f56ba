import { readFileSync } from 'node:fs';
import { describe, expect, it, vi } from 'vitest';
import { CELL_KINDS, CELL_KIND_NAMES, cellSchema } from '@shared/cells/registry';
import { EDGE_COLOURS } from '@shared/cells/colours';
import { checkSheet, emptySheetDocument, type SheetDocument } from '@shared/sheet';
import { cannotAddReason, defaultCell, insertCell } from '@shared/sheet/cell-ops';
import { sheetCellDependencies } from '@shared/sheet/dependencies';

/**
 * A sheet to which every kind can be added: a model, a simulation of it, a probe of that (a sweep
 * reads a probe) and a data cell (a fit reads one), made by their own defaults.
 */
function sheetWithModelAndSimulation(): SheetDocument {
  let doc = emptySheetDocument('Every kind');
  for (const kind of ['params', 'model', 'simulation', 'probe', 'data'] as const) {
    doc = insertCell(doc, doc.cells.length, defaultCell(kind, doc, doc.cells.length));
  }
  return doc;
}

const baseCss = readFileSync(new URL('../../../src/styles/base.css', import.meta.url), 'utf8');

describe('the cell-kind registry', () => {
  it('lists every kind of the document schema once', () => {
    const schemaKinds = cellSchema.options.map((option) => option.shape.kind.value).sort();
    expect([...CELL_KIND_NAMES].sort()).toEqual(schemaKinds);
    for (const kind of CELL_KIND_NAMES) expect(CELL_KINDS[kind].kind).toBe(kind);
  });

  it.each(CELL_KIND_NAMES)(
    'gives the %s kind a label, words, and an edge colour the page defines',
    (kind) => {
      const definition = CELL_KINDS[kind];
      expect(definition.label.trim()).not.toBe('');
      expect(definition.word).toBe(definition.word.toLowerCase());
      expect(EDGE_COLOURS).toContain(definition.colour);
      expect(baseCss).toContain(`--meander-edge-${definition.colour}:`);
    },
  );

  it.each(CELL_KIND_NAMES)('makes a new %s cell that passes its schema and the checker', (kind) => {
    const base = sheetWithModelAndSimulation();
    expect(checkSheet(base)).toEqual([]);
    const index = base.cells.length;
    expect(cannotAddReason(base, kind, index)).toBeNull();
    const cell = defaultCell(kind, base, index);
    expect(cellSchema.safeParse(cell).success).toBe(true);
    const doc = insertCell(base, index, cell);
    expect(checkSheet(doc).filter((issue) => issue.cellId === cell.id)).toEqual([]);
    expect(CELL_KINDS[kind].title(cell as never)).toEqual(expect.any(String));
    expect(sheetCellDependencies(doc).has(cell.id)).toBe(true);
  });

  it('says why a kind that reads another cannot be added to an empty sheet', () => {
    const empty = emptySheetDocument('Empty');
    expect(cannotAddReason(empty, 'simulation', 0)).toBe('add a model first');
    expect(cannotAddReason(empty, 'probe', 0)).toBe('add a simulation first');
    expect(cannotAddReason(empty, 'note', 0)).toBeNull();
  });
});

describe('kind modules', () => {
  // A kind module must not import, even indirectly, a module that reads the registry while it is
  // being evaluated, or whichever module is imported first breaks the registry's initialisation.
  it.each(CELL_KIND_NAMES)('can be the first module imported (%s)', async (kind) => {
    vi.resetModules();
    const module = (await import(`../../../shared/cells/${kind}.ts`)) as Record<string, unknown>;
    expect(module[`${kind}Kind`]).toBeDefined();
    const registry = await import('@shared/cells/registry');
    expect(Object.keys(registry.CELL_KINDS)).toContain(kind);
  });
});
