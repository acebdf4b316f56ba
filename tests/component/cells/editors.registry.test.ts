import { describe, expect, it } from 'vitest';
import { CELL_KIND_NAMES } from '@shared/cells/registry';
import {
  defaultCellEditors,
  defaultCellReadings,
  editorKinds,
  readingKinds,
} from '@/components/cells/editors';

describe('cell editors', () => {
  it('register an editor for every kind of the registry, and nothing else', () => {
    expect([...editorKinds()].sort()).toEqual([...CELL_KIND_NAMES].sort());
    for (const kind of CELL_KIND_NAMES) expect(defaultCellEditors[kind]).toBeDefined();
  });

  it('register a reading view for every kind of the registry, and nothing else', () => {
    expect([...readingKinds()].sort()).toEqual([...CELL_KIND_NAMES].sort());
    for (const kind of CELL_KIND_NAMES) expect(defaultCellReadings[kind]).toBeDefined();
  });
});
