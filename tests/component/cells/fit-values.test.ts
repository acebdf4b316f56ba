import { describe, expect, it } from 'vitest';
import { shallowRef } from 'vue';
import { useSheetDocument } from '@/stores/sheet/document';
import { useFitValues } from '@/stores/sheet/fit-values';
import type { SheetRunsState } from '@/stores/sheet/runs';
import type { FitResult } from '@shared/fit/problem';
import type { CellOutput } from '@shared/run/outputs';
import type { SheetDocument } from '@shared/sheet/document';
import { reservoirSheet } from './fixtures';

/** "Use these values": one ordinary edit through the document's commit, and its undo. */
function setUp(role: 'owner' | 'viewer' = 'owner') {
  const state = useSheetDocument();
  const committed: SheetDocument[] = [];
  state.whenCommitted((next) => committed.push(next));
  state.sheetId.value = 'sheet-1';
  state.role.value = role;
  const original = reservoirSheet();
  state.document.value = original;
  state.serverDocument.value = original;
  const estimates: FitResult['estimates'] = [
    {
      name: 'kappa',
      unit: '1/day',
      estimate: 0.612345678,
      standardError: 0.05,
      ci: [0.5, 0.7],
      atBound: false,
    },
    { name: 'sigma', unit: '', estimate: 0.5, standardError: 0.02, ci: [0.46, 0.54], atBound: false },
  ];
  const output = {
    kind: 'fit',
    result: { ok: true, estimates },
    finishedAt: new Date(),
    seconds: 0,
  } as CellOutput;
  const runs = { outputs: shallowRef<Record<string, CellOutput | undefined>>({ fit: output }) };
  const values = useFitValues(state, runs as unknown as SheetRunsState);
  return { state, values, committed, original };
}

const valueOf = (doc: SheetDocument | null, name: string) =>
  doc?.cells.flatMap((c) => (c.kind === 'params' ? c.params : [])).find((p) => p.name === name)?.value;

describe('using a fit’s values', () => {
  it('writes the estimates into the parameters cell as one commit, which makes the sheet dirty', () => {
    const { state, values, committed } = setUp();
    expect(values.useFitEstimates('fit')).toBe(2);
    expect(committed).toHaveLength(1);
    expect(valueOf(state.document.value, 'kappa')).toBe(0.612346);
    expect(valueOf(state.document.value, 'sigma')).toBe(0.5);
    expect(state.dirty.value).toBe(true);
    expect(values.lastValuesEdit.value?.changes.map((c) => `${c.name}:${c.from}`)).toEqual([
      'kappa:0.8',
      'sigma:0.45',
    ]);
  });

  it('undoes exactly that edit, leaving the sheet as it was', () => {
    const { state, values, original } = setUp();
    values.useFitEstimates('fit');
    values.undoFitEstimates();
    expect(state.document.value).toEqual(original);
    expect(state.dirty.value).toBe(false);
    expect(values.lastValuesEdit.value).toBeNull();
  });

  it('changes nothing for a viewer', () => {
    const { state, values, committed, original } = setUp('viewer');
    expect(values.useFitEstimates('fit')).toBe(0);
    expect(committed).toHaveLength(0);
    expect(state.document.value).toEqual(original);
  });
});
