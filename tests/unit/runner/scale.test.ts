import { describe, expect, it } from 'vitest';
import { scaleSheetPaths } from '@shared/run/scale';
import { findExampleSheet } from '@shared/examples/index';

describe('scaleSheetPaths', () => {
  const doc = findExampleSheet('soil-moisture-anomaly')!.document;

  it('scales simulation and study path counts and leaves the original untouched', () => {
    const scaled = scaleSheetPaths(doc, 0.05);
    const sim = scaled.cells.find((c) => c.kind === 'simulation');
    const study = scaled.cells.find((c) => c.kind === 'study');
    expect(sim && sim.kind === 'simulation' && sim.paths).toBe(1000); // 20 000 × 0.05
    expect(study && study.kind === 'study' && study.paths).toBe(100); // 2000 × 0.05
    const original = doc.cells.find((c) => c.kind === 'simulation');
    expect(original && original.kind === 'simulation' && original.paths).toBe(20_000);
  });

  it('keeps at least one simulation path and the study minimum of ten', () => {
    const scaled = scaleSheetPaths(doc, 1e-9);
    for (const cell of scaled.cells) {
      if (cell.kind === 'simulation') expect(cell.paths).toBe(1);
      if (cell.kind === 'study') expect(cell.paths).toBe(10);
    }
  });

  it('rejects a zero or negative scale', () => {
    expect(() => scaleSheetPaths(doc, 0)).toThrow(/positive number/);
    expect(() => scaleSheetPaths(doc, Number.NaN)).toThrow(/positive number/);
  });
});
