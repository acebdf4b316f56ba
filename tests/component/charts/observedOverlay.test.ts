import { describe, expect, it } from 'vitest';
import { simulate } from '@shared/engine/simulate';
import type { CellOutput } from '@shared/run/outputs';
import { buildSimulationPlan, sheetDocumentSchema } from '@shared/sheet/index';
import { buildFanChart } from '@/components/charts/fanChart';
import { buildHistogramChart } from '@/components/charts/histogramChart';
import { buildPathsChart } from '@/components/charts/pathsChart';
import { observedOverlayFor } from '@/components/charts/observedOverlay';

/** Invented: water level in a reed-bed lagoon relaxing to 40 cm, read at a few irregular times. */
const doc = sheetDocumentSchema.parse({
  schemaVersion: 1,
  title: 'Lagoon level',
  cells: [
    { id: 'p', kind: 'params', params: [{ name: 'a', value: 0.8 }] },
    {
      id: 'm',
      kind: 'model',
      states: [{ name: 'L', initial: '30', drift: 'a * (40 - L)', diffusion: { W: '2' } }],
      noises: [{ name: 'W' }],
    },
    { id: 'run', kind: 'simulation', model: 'm', t1: 4, steps: 80, paths: 400, seed: 11 },
    { id: 'fan', kind: 'chart', simulation: 'run', view: 'fan', state: 'L' },
    { id: 'hist', kind: 'chart', simulation: 'run', view: 'histogram', state: 'L', time: 4 },
    { id: 'paths', kind: 'chart', simulation: 'run', view: 'paths', state: 'L' },
    {
      id: 'obs',
      kind: 'data',
      dataset: { id: 'lagoon', checksum: 'c'.repeat(64), name: 'gauge readings' },
      model: 'm',
      timeColumn: 'day',
      columns: [{ column: 'level', state: 'L', unit: 'cm' }],
    },
  ],
});
const plan = buildSimulationPlan(doc, 'run');
const result = simulate(plan);
const chartCell = (id: string) => {
  const cell = doc.cells.find((c) => c.id === id);
  if (cell?.kind !== 'chart') throw new Error(`no chart ${id}`);
  return cell;
};
// 30 and 39 sit inside the band at their times; 80 is far outside; t = 9 lies after the run.
const dataOutput: CellOutput = {
  kind: 'data',
  finishedAt: new Date(),
  observed: {
    datasetId: 'lagoon',
    checksum: 'c'.repeat(64),
    name: 'gauge readings',
    columns: [{ column: 'level', state: 'L', unit: 'cm' }],
    series: [{ group: null, times: [0, 2.5, 3, 3.98, 9], values: { L: [30, 39, 80, null, 41] } }],
  },
};
const outputs = { obs: dataOutput };

describe('observed data on charts', () => {
  it('collects the mapped points of the chart state, skipping missing values', () => {
    const overlay = observedOverlayFor(doc, outputs, chartCell('fan'));
    expect(overlay).toMatchObject({ unit: 'cm', times: [0, 2.5, 3, 9], values: [30, 39, 80, 41] });
    expect(observedOverlayFor(doc, {}, chartCell('fan'))).toBeNull();
  });

  it('draws the points on a fan, puts them in its CSV with their unit, and reads off the coverage', () => {
    const overlay = observedOverlayFor(doc, outputs, chartCell('fan'));
    const built = buildFanChart({ chart: chartCell('fan'), result, plan, observed: overlay });
    if (!built.ok) throw new Error(built.message);
    expect(built.spec.traces.at(-1)).toMatchObject({ mode: 'markers', y: [30, 39, 80, 41] });
    const lines = built.spec.csv.trim().split('\r\n');
    expect(lines[0]).toBe('t,q05,q25,median,q75,q95,mean,live_paths,observed_group,observed_L [cm]');
    expect(lines.at(-1)).toBe('9,,,,,,,,,41');
    expect(built.spec.readout).toMatch(
      /^Calibration: 2 of 3 observed points \(66\.7 %\) lie inside the simulated 5–95 % band; 95 % Clopper–Pearson interval/,
    );
    expect(built.spec.readout).toMatch(/1 point outside the simulated times not counted/);
  });

  it('draws the points on sample paths and in their CSV', () => {
    const overlay = observedOverlayFor(doc, outputs, chartCell('paths'));
    const built = buildPathsChart({ chart: chartCell('paths'), result, plan, observed: overlay });
    if (!built.ok) throw new Error(built.message);
    expect(built.spec.csv.split('\r\n')[0]).toMatch(/,observed_group,observed_L \[cm\]$/);
    expect(built.spec.caption).toMatch(/diamonds: observed \(gauge readings\)/);
  });

  it('marks the observations near the histogram time as a rug, with the unit on the axis', () => {
    const overlay = observedOverlayFor(doc, outputs, chartCell('hist'));
    const built = buildHistogramChart({ chart: chartCell('hist'), result, plan, observed: overlay });
    if (!built.ok) throw new Error(built.message);
    // Saved every 0.05 up to 4: only the reading at 3.98 would be near, and it is missing.
    expect(built.spec.caption).not.toMatch(/ticks/);
    const later: CellOutput = {
      ...dataOutput,
      observed: { ...dataOutput.observed, series: [{ group: null, times: [3.99], values: { L: [38.5] } }] },
    };
    const withRug = buildHistogramChart({
      chart: chartCell('hist'),
      result,
      plan,
      observed: observedOverlayFor(doc, { obs: later }, chartCell('hist')),
    });
    if (!withRug.ok) throw new Error(withRug.message);
    expect(withRug.spec.traces.at(-1)).toMatchObject({ x: [38.5], y: [0] });
    expect(withRug.spec.csv.split('\r\n')[0]).toMatch(/,observed_L \[cm\]$/);
    expect(withRug.spec.layout.xaxis).toMatchObject({
      title: expect.objectContaining({ text: expect.stringContaining('cm') }),
    });
  });
});
