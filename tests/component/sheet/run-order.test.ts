import { describe, expect, it } from 'vitest';
import { cellFingerprint, sheetCellDependencies, stableStringify, type SheetDocument } from '@shared/sheet';
import { planRunSteps } from '@shared/run/steps';
import { pondSheet } from './harness';

/** The order of a run and the fingerprints behind stale marking, without mounting anything. */
function withStudyAndChart(): SheetDocument {
  const doc = pondSheet();
  return {
    ...doc,
    cells: [
      ...doc.cells.slice(0, 3),
      {
        id: 'study-steps',
        kind: 'study',
        simulation: 'simulation-season',
        levels: 4,
        coarsestSteps: 10,
        paths: 200,
        reference: 'finest',
      },
      { id: 'chart-fan', kind: 'chart', simulation: 'simulation-season', view: 'fan', state: 'A' },
      ...doc.cells.slice(3),
    ],
  };
}

describe('planRunSteps', () => {
  it('runs every simulation before the probes and studies, whatever their place in the sheet', () => {
    const doc = withStudyAndChart();
    const steps = planRunSteps(doc, null, sheetCellDependencies(doc));
    expect(steps.map((step) => step.cellId)).toEqual(['simulation-season', 'study-steps', 'probe-bloom']);
    expect(steps.every((step) => step.force)).toBe(true);
  });

  it('runs a probe with its simulation, the simulation only if its output is not current', () => {
    const doc = withStudyAndChart();
    const steps = planRunSteps(doc, 'probe-bloom', sheetCellDependencies(doc));
    expect(steps).toEqual([
      { cellId: 'simulation-season', kind: 'simulation', force: false },
      { cellId: 'probe-bloom', kind: 'probe', force: true },
    ]);
  });

  it('runs the simulation a chart reads, and every numerical cell that reads a parameters cell', () => {
    const doc = withStudyAndChart();
    const dependencies = sheetCellDependencies(doc);
    expect(planRunSteps(doc, 'chart-fan', dependencies).map((step) => step.cellId)).toEqual([
      'simulation-season',
    ]);
    expect(planRunSteps(doc, 'params-main', dependencies).map((step) => step.cellId)).toEqual([
      'simulation-season',
      'study-steps',
      'probe-bloom',
    ]);
    expect(planRunSteps(doc, 'note-intro', dependencies)).toEqual([]);
  });
});

describe('fingerprints', () => {
  it('do not depend on the order of object keys', () => {
    expect(stableStringify({ b: 1, a: [{ d: 2, c: 3 }] })).toBe(
      stableStringify({ a: [{ c: 3, d: 2 }], b: 1 }),
    );
  });

  it('change when an input changes and stay put when an unrelated cell changes', () => {
    const doc = pondSheet();
    const dependencies = sheetCellDependencies(doc);
    const before = cellFingerprint(doc, 'simulation-season', dependencies);
    const noteEdited = {
      ...doc,
      cells: doc.cells.map((cell) => (cell.kind === 'note' ? { ...cell, text: 'changed' } : cell)),
    };
    expect(cellFingerprint(noteEdited, 'simulation-season', sheetCellDependencies(noteEdited))).toBe(before);
    const modelEdited = {
      ...doc,
      cells: doc.cells.map((cell) =>
        cell.kind === 'model' ? { ...cell, calculus: 'stratonovich' as const } : cell,
      ),
    };
    expect(cellFingerprint(modelEdited, 'simulation-season', sheetCellDependencies(modelEdited))).not.toBe(
      before,
    );
  });
});
