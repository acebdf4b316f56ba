import { describe, expect, it } from 'vitest';
import { exampleSheets } from '@shared/examples/index';
import { inProcessExecutor } from '@shared/run/environments';
import { cellOutputJson } from '@shared/run/output-json';
import { runSheet } from '@shared/run/run-sheet';
import { scaleSheetPaths } from '@shared/run/scale';
import {
  keptTimeIndices,
  MAX_PATHS,
  MAX_TIMES,
  outputsFromResults,
  summariseResults,
  versionResultsSchema,
} from '@shared/run/version-results';
import { buildSimulationPlan } from '@shared/sheet/plan';
import { sheetCellDependencies, sheetFingerprints } from '@shared/sheet';

/**
 * The results summary saved with a version: small, accepted by its own schema after a trip
 * through JSON, and read back into outputs whose reported numbers are the run's own.
 */
describe('results saved with a version', () => {
  it('keep at most MAX_TIMES saved times, always the first and the last', () => {
    expect(keptTimeIndices(5)).toEqual([0, 1, 2, 3, 4]);
    const many = keptTimeIndices(10_001);
    expect(many.length).toBeLessThanOrEqual(MAX_TIMES);
    expect(many[0]).toBe(0);
    expect(many.at(-1)).toBe(10_000);
    expect(many.every((k, j) => j === 0 || k > many[j - 1]!)).toBe(true);
  });

  for (const example of exampleSheets) {
    it(`read back with the run's own reported numbers and digests: ${example.slug}`, async () => {
      const doc = scaleSheetPaths(example.document, 0.05);
      const fingerprints = sheetFingerprints(doc, sheetCellDependencies(doc));
      const run = await runSheet(doc, { executor: inProcessExecutor() });
      const summary = summariseResults(doc, (id) => run.outputs.get(id), fingerprints);
      expect(Object.keys(summary).length).toBeGreaterThan(0);

      // What the server stores and sends back: JSON, checked by the same schema.
      const text = JSON.stringify(summary);
      // "Tens of kilobytes" (the size), with room: no per-path values travel.
      expect(text.length).toBeLessThan(200_000);
      const parsed = versionResultsSchema.parse(JSON.parse(text));
      const restored = outputsFromResults(doc, parsed, (id) => buildSimulationPlan(doc, id), new Date());

      for (const [cellId, kept] of run.outputs) {
        if (kept.output.kind === 'error') continue;
        const back = restored.get(cellId);
        expect(back, cellId).toBeDefined();
        const cell = doc.cells.find((c) => c.id === cellId)!;
        // Everything the runner reports of the output (final moments, losses, stability,
        // probe estimates, study orders, digest) is the same after the trip.
        expect(cellOutputJson(cellId, cell.kind, back!)).toEqual(
          cellOutputJson(cellId, cell.kind, kept.output),
        );
        if (back?.kind === 'simulation') {
          expect(back.result.samplePaths.every((paths) => paths.length <= MAX_PATHS)).toBe(true);
          // Per-path values are not part of the summary.
          expect(back.result.savedValues.every((values) => values.length === 0)).toBe(true);
        }
      }
      // Summarising what was read back gives the same summary: a save that carries results on
      // (shown from an older version) stores them unchanged.
      const again = summariseResults(
        doc,
        (id) => {
          const output = restored.get(id);
          return output ? { output, fingerprint: fingerprints[id]! } : undefined;
        },
        fingerprints,
      );
      expect(again).toEqual(parsed);
    });
  }

  it('leave out outputs whose inputs changed since they were computed', async () => {
    const doc = scaleSheetPaths(exampleSheets[0]!.document, 0.05);
    const fingerprints = sheetFingerprints(doc, sheetCellDependencies(doc));
    const run = await runSheet(doc, { executor: inProcessExecutor() });
    const changed = Object.fromEntries(
      Object.keys(fingerprints).map((id) => [id, `${fingerprints[id]}-edited`]),
    );
    expect(summariseResults(doc, (id) => run.outputs.get(id), changed)).toEqual({});
  });

  it('are refused by the schema when a number list is longer than the summary allows', () => {
    const long = Array.from({ length: MAX_TIMES + 1 }, () => 0);
    const bad = {
      sim: {
        kind: 'probe',
        estimate: { estimate: 1, standardError: 0.1, ci: [0.8, 1.2], paths: 10 },
      },
      sim2: { kind: 'study', seconds: 1, result: { levels: long } },
    };
    expect(versionResultsSchema.safeParse(bad).success).toBe(false);
  });
});
