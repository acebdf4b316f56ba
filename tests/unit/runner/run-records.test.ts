import { describe, expect, it } from 'vitest';
import { findExampleSheet } from '@shared/examples/index';
import { compareRerun } from '@shared/run/compare';
import { inProcessExecutor } from '@shared/run/environments';
import { currentRunRecords, runSheet } from '@shared/run/run-sheet';
import { scaleSheetPaths } from '@shared/run/scale';
import { sheetCellDependencies, sheetFingerprints } from '@shared/sheet';

/**
 * What a saved version keeps of its runs (digests and final moments) is enough for "rerun and
 * compare": bit for bit under the same engine version, within the Monte Carlo errors under
 * another one.
 */
describe('saved run records', () => {
  it('let a rerun be compared bit for bit, or within its errors after an engine change', async () => {
    const doc = scaleSheetPaths(findExampleSheet('soil-moisture-anomaly')!.document, 0.1);
    const fingerprints = sheetFingerprints(doc, sheetCellDependencies(doc));
    const first = await runSheet(doc, { executor: inProcessExecutor() });
    const saved = currentRunRecords(doc, (id) => first.outputs.get(id), fingerprints);
    const simulationIds = Object.keys(saved.digests);
    expect(simulationIds.length).toBeGreaterThan(0);
    for (const id of simulationIds) {
      expect(saved.moments[id]!.paths).toBeGreaterThan(0);
      expect(Object.values(saved.moments[id]!.final).every((state) => state.mean !== null)).toBe(true);
    }

    const second = await runSheet(doc, { executor: inProcessExecutor() });
    const rerun = currentRunRecords(doc, (id) => second.outputs.get(id), fingerprints);
    const records = (records: typeof saved, engineVersion: number) =>
      Object.fromEntries(
        Object.entries(records.digests).map(([id, digest]) => [
          id,
          { digest, engineVersion, ...records.moments[id] },
        ]),
      );
    const same = compareRerun(records(saved, 3), records(rerun, 3), 3);
    expect(same.checks.every((check) => check.outcome === 'reproduced')).toBe(true);

    // Saved by an older engine, rerun by this one: the digests are not compared, the moments are
    // (identical numbers here, so 0 standard errors apart).
    const afterUpgrade = compareRerun(records(saved, 2), records(rerun, 3), 3);
    expect(afterUpgrade.engineChanged).toBe(true);
    expect(afterUpgrade.checks.every((check) => check.outcome === 'agrees')).toBe(true);
    expect(afterUpgrade.allGood).toBe(true);
  });
});
