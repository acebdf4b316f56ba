import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { applyEstimates, revertEstimates } from '@shared/fit/use-values';
import { inProcessExecutor } from '@shared/run/environments';
import { type CellOutput } from '@shared/run/outputs';
import { cellOutputJson } from '@shared/run/output-json';
import { resultFiles } from '@shared/run/results-csv';
import { runSheet, type SheetRun } from '@shared/run/run-sheet';
import { outputsFromResults, summariseResults, versionResultsSchema } from '@shared/run/version-results';
import { scaleSheetPaths } from '@shared/run/scale';
import { parseSheetFile, sheetFileDatasets } from '@shared/sheet-file/sheet-file';
import { sheetCellDependencies, sheetFingerprints, type SheetDocument } from '@shared/sheet';
import { buildSimulationPlan } from '@shared/sheet/plan';

/** A fit's output beyond its numbers: the results CSV, the summary saved with a version, "Use these values". */
const demo = new URL('../../../shared/examples/sheet-files/pond-oxygen.meander.json', import.meta.url);

describe('a fit in the pond-oxygen demo', () => {
  let doc: SheetDocument;
  let run: SheetRun;
  let fit: Extract<CellOutput, { kind: 'fit' }>;

  beforeAll(async () => {
    const parsed = await parseSheetFile(JSON.parse(readFileSync(demo, 'utf8')));
    if (!parsed.ok) throw new Error('the demo sheet file does not parse');
    doc = scaleSheetPaths(parsed.file.document, 0.05);
    run = await runSheet(doc, { executor: inProcessExecutor(), datasets: sheetFileDatasets(parsed.file) });
    const output = run.outputs.get('pond-fit')?.output;
    if (output?.kind !== 'fit') throw new Error(`the fit did not run: ${JSON.stringify(output)}`);
    fit = output;
  });

  it('writes one row per estimated parameter into fits.csv, with its unit and interval', () => {
    const file = resultFiles(doc, (id) => run.outputs.get(id)?.output).find((f) => f.fileName === 'fits.csv');
    const lines = file!.csv.trim().split('\r\n');
    expect(lines[0]).toMatch(/^cell,method,parameter,unit,estimate,standard_error,ci95_low,ci95_high/);
    expect(lines).toHaveLength(4);
    const kappa = lines[1]!.split(',');
    expect(kappa.slice(0, 4)).toEqual(['pond-fit', 'exact', 'kappa', '1/day']);
    expect(Number(kappa[4])).toBe(fit.result.estimates[0]!.estimate);
    expect(Number(kappa[6])).toBe(fit.result.estimates[0]!.ci[0]);
  });

  it('is saved with a version and read back with the same reported numbers', () => {
    const fingerprints = sheetFingerprints(doc, sheetCellDependencies(doc));
    const summary = summariseResults(doc, (id) => run.outputs.get(id), fingerprints);
    const parsed = versionResultsSchema.parse(JSON.parse(JSON.stringify(summary)));
    const back = outputsFromResults(doc, parsed, (id) => buildSimulationPlan(doc, id), new Date()).get(
      'pond-fit',
    );
    expect(back?.kind).toBe('fit');
    expect(cellOutputJson('pond-fit', 'fit', back!)).toEqual(cellOutputJson('pond-fit', 'fit', fit));
  });

  it('writes its estimates into the parameters cell as one edit, and takes exactly that edit back', () => {
    const { doc: next, changes } = applyEstimates(doc, fit.result.estimates);
    expect(changes.map((c) => c.name)).toEqual(['kappa', 'mu', 'sigma']);
    const params = next.cells.find((c) => c.kind === 'params');
    const kappa = params?.kind === 'params' ? params.params.find((p) => p.name === 'kappa') : undefined;
    expect(kappa?.value).toBeCloseTo(fit.result.estimates[0]!.estimate, 5);
    // The fit's own inputs changed (its starting values), so it and the simulation go stale.
    const before = sheetFingerprints(doc, sheetCellDependencies(doc));
    const after = sheetFingerprints(next, sheetCellDependencies(next));
    expect(after['pond-run']).not.toBe(before['pond-run']);
    expect(revertEstimates(next, changes)).toEqual(doc);
  });
});
