import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { findExampleSheet } from '@shared/examples/index';
import { cellSchema } from '@shared/cells/registry';
import {
  DocumentVersionError,
  parseSheetDocument,
  upgradeDocument,
  type UpgradeChain,
} from '@shared/sheet/upgrade';

/**
 * A test-only format 2: note cells gain a `format` field and simulations rename `paths` to
 * `pathCount`. The chain turns a stored format-1 document into it step by step.
 */
const noteV2 = z.object({
  id: z.string(),
  kind: z.literal('note'),
  text: z.string(),
  format: z.literal('markdown'),
});
const documentV2 = z.object({
  schemaVersion: z.literal(2),
  title: z.string(),
  cells: z.array(
    z.union([
      noteV2,
      z
        .object({ kind: z.literal('simulation'), pathCount: z.number().int() })
        .passthrough()
        .refine((cell) => !('paths' in cell), 'paths was renamed pathCount'),
      cellSchema.refine((cell) => cell.kind !== 'note' && cell.kind !== 'simulation'),
    ]),
  ),
});

const toVersion2: UpgradeChain = {
  target: 2,
  steps: {
    1: (doc) => ({
      ...doc,
      cells: (doc.cells as Record<string, unknown>[]).map((cell) => {
        if (cell.kind === 'note') return { ...cell, format: 'markdown' };
        if (cell.kind !== 'simulation') return cell;
        const { paths, ...rest } = cell;
        return { ...rest, pathCount: paths };
      }),
    }),
  },
};

describe('upgradeDocument', () => {
  it('opens a version-1 document after a format-2 change, upgraded step by step', () => {
    const stored = JSON.parse(JSON.stringify(findExampleSheet('harvested-fish-stock')!.document));
    const upgraded = upgradeDocument(stored, toVersion2);
    const parsed = documentV2.safeParse(upgraded);
    expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
    const simulations = parsed.data!.cells.filter((cell) => cell.kind === 'simulation');
    expect(simulations.length).toBeGreaterThan(0);
    const original = stored.cells.filter((cell: { kind: string }) => cell.kind === 'simulation');
    expect(simulations.map((cell) => (cell as { pathCount: number }).pathCount)).toEqual(
      original.map((cell: { paths: number }) => cell.paths),
    );
    // The stored document itself is left as it was.
    expect(stored.schemaVersion).toBe(1);
  });

  it('leaves a current document unchanged and hands a shapeless value to the schema', () => {
    const doc = findExampleSheet('soil-moisture-anomaly')!.document;
    expect(upgradeDocument(doc)).toEqual(doc);
    expect(upgradeDocument('not a sheet')).toBe('not a sheet');
    expect(parseSheetDocument({ title: 'no version', cells: [] }).success).toBe(false);
  });

  it('refuses a format newer than this Meander reads, saying so on schemaVersion', () => {
    expect(() => upgradeDocument({ schemaVersion: 9, title: 'x', cells: [] })).toThrow(DocumentVersionError);
    const parsed = parseSheetDocument({ schemaVersion: 9, title: 'x', cells: [] });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0]!.path).toEqual(['schemaVersion']);
    expect(parsed.error!.issues[0]!.message).toMatch(/newer than this Meander reads/);
  });

  it('says when there is no upgrade step from an old format', () => {
    expect(() =>
      upgradeDocument({ schemaVersion: 1, title: 'x', cells: [] }, { target: 3, steps: toVersion2.steps }),
    ).toThrow(/no upgrade from sheet format 2/);
  });
});
