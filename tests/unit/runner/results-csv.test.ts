import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { inProcessExecutor } from '@shared/run/environments';
import { resultFileNames, resultFiles } from '@shared/run/results-csv';
import { runSheet } from '@shared/run/run-sheet';
import { sheetDocumentSchema } from '@shared/sheet/index';

const fixture = sheetDocumentSchema.parse(
  JSON.parse(readFileSync(new URL('./fixtures/small-relaxation.json', import.meta.url), 'utf8')),
);

describe('results as CSV files', () => {
  it('writes statistics, sample paths, probes and studies, with units in the column names', async () => {
    const run = await runSheet(fixture, { executor: inProcessExecutor() });
    const files = resultFiles(fixture, (id) => run.outputs.get(id)?.output);
    expect(files.map((file) => file.fileName)).toEqual([
      'gauge-run-statistics.csv',
      'gauge-run-sample-paths.csv',
      'probes.csv',
      'studies.csv',
    ]);
    // The menu's cheap listing names the same files in the same order.
    expect(resultFileNames(fixture, (id) => run.outputs.get(id)?.output)).toEqual(
      files.map((file) => file.fileName),
    );
    const output = run.outputs.get('gauge-run')!.output;
    if (output.kind !== 'simulation') throw new Error('no simulation output');
    const stats = files[0]!.csv.trim().split('\r\n');
    expect(stats[0]).toBe(
      't [time],Y_mean [V],Y_variance [(V)²],Y_q05 [V],Y_q25 [V],Y_q50 [V],Y_q75 [V],Y_q95 [V],Y_min [V],Y_max [V],Y_live_paths',
    );
    // One row per saved time; the last row carries the engine's own numbers at t1.
    expect(stats).toHaveLength(1 + output.result.savedTimes.length);
    const last = stats.at(-1)!.split(',').map(Number);
    const final = output.result.stats[0]!;
    const k = output.result.savedTimes.length - 1;
    expect(last[0]).toBe(2);
    expect(last[1]).toBe(final.mean[k]);
    expect(last[8]).toBe(final.min[k]);
    expect(last[10]).toBe(3000);

    const paths = files[1]!.csv.trim().split('\r\n');
    expect(paths[0]).toBe('state,unit,path,t [time],value');
    const kept = output.result.samplePaths[0]!.length;
    expect(paths).toHaveLength(1 + kept * output.result.savedTimes.length);
    expect(paths[1]).toBe(`Y,V,1,0,${output.result.samplePaths[0]![0]![0]}`);

    const probes = files[2]!.csv.trim().split('\r\n');
    expect(probes[0]).toBe('cell,probe,unit,estimate,standard_error,ci95_low,ci95_high,paths,warnings');
    expect(probes[1]).toMatch(/^gauge-probe,P\(≥ level\) of Y,probability,0\.\d+,/);

    const study = run.outputs.get('gauge-study')!.output;
    if (study.kind !== 'study') throw new Error('no study output');
    const studies = files[3]!.csv.trim().split('\r\n');
    expect(studies).toHaveLength(1 + study.result.levels.length);
    expect(studies[1]).toBe(
      ['gauge-study', 'finest', study.result.levels[0]!.steps, study.result.levels[0]!.h].join(',') +
        `,${studies[1]!.split(',').slice(4).join(',')}`,
    );
  });

  it('leaves out cells without a current output', () => {
    expect(resultFiles(fixture, () => undefined)).toEqual([]);
    expect(resultFileNames(fixture, () => undefined)).toEqual([]);
  });
});
