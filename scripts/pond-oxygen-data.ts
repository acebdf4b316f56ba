import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { sha256Hex } from '../shared/data/checksum';
import { streamSeed } from '../shared/engine/random/stream-seed';
import { Xoshiro128 } from '../shared/engine/random/xoshiro128';
import { normalFrom } from '../shared/engine/random/ziggurat';
import { buildSheetFile } from '../shared/sheet-file/sheet-file';
import { sheetDocumentSchema } from '../shared/sheet/document';

/**
 * Writes the demo sheet file shared/examples/sheet-files/pond-oxygen.meander.json: an invented
 * dissolved-oxygen deficit in two mill ponds after a summer storm, observed every one to three
 * days for 120 days, with its sheet (data cell, model, a fit of κ, μ and σ by the exact
 * likelihood, fan chart with the observations).
 *
 * The data are simulated, not measured. Model (Ornstein–Uhlenbeck, sampled with its exact
 * Gaussian transition, so no discretisation error):
 *
 *   dD = κ (μ − D) dt + σ dW
 *   D(t + Δ) = μ + (D(t) − μ) e^{−κΔ} + σ √((1 − e^{−2κΔ}) / (2κ)) · Z,   Z ~ N(0, 1)
 *
 * TRUE PARAMETER VALUES (what a fit to these data should recover, within its errors):
 *   κ = 0.35 per day, μ = 2.4 mg/L, σ = 0.55 mg/L per √day;
 *   initial deficits D(0) = 5.1 mg/L (upper pond) and 4.6 mg/L (lower pond).
 * Values are rounded to 3 decimals on writing (an error of at most 0.0005 mg/L); two readings
 * are left empty to show missing values. Seed 20261202.
 */

const TRUE = { kappa: 0.35, mu: 2.4, sigma: 0.55 };
const PONDS = [
  { name: 'upper', initial: 5.1 },
  { name: 'lower', initial: 4.6 },
];
const SEED = 20261202;
const HORIZON = 120;
/** Readings lost in the demo (pond, day): the file leaves these cells empty. */
const MISSING = new Set(['upper:31', 'lower:74']);

function generator(stream: number): Xoshiro128 {
  const state = new Uint32Array(4);
  streamSeed(SEED, stream, state);
  return new Xoshiro128(state);
}

function seriesRows(): string[] {
  const rows: string[] = [];
  PONDS.forEach((pond, index) => {
    const random = generator(index);
    let t = 0;
    let deficit = pond.initial;
    for (;;) {
      const value = MISSING.has(`${pond.name}:${t}`) ? '' : deficit.toFixed(3);
      rows.push(`${t},${pond.name},${value}`);
      const step = 1 + Math.floor(random.nextOpenUnit() * 3);
      if (t + step > HORIZON) break;
      const decay = Math.exp(-TRUE.kappa * step);
      const sd = TRUE.sigma * Math.sqrt((1 - decay * decay) / (2 * TRUE.kappa));
      deficit = TRUE.mu + (deficit - TRUE.mu) * decay + sd * normalFrom(random);
      t += step;
    }
  });
  return rows;
}

const document = sheetDocumentSchema.parse({
  schemaVersion: 1,
  title: 'Mill-pond oxygen deficit after a storm (invented data)',
  cells: [
    {
      id: 'pond-intro',
      kind: 'note',
      text:
        '# Oxygen deficit in two mill ponds\n\n' +
        'D is how far dissolved oxygen sits below saturation, in mg/L. After a summer storm washes organic matter in, ' +
        'the deficit relaxes towards its usual level μ at rate κ, shaken by weather and inflow (intensity σ):\n\n' +
        'dD = κ (μ − D) dt + σ dW\n\n' +
        '**The observations in this sheet are invented data for the demo**, simulated from this very model ' +
        '(scripts/pond-oxygen-data.ts states the values used). The parameters below are first guesses, not estimates: ' +
        'compare the band with the diamonds and read the calibration line under the fan chart. ' +
        'The fit cell estimates κ, μ and σ from the readings of both ponds; "Use these values" puts the estimates ' +
        'into the parameters, and a rerun shows the band that follows from them.\n\n' +
        'Real water-quality or fish-welfare decisions need measured data, a checked model and qualified review.',
    },
    {
      id: 'pond-params',
      kind: 'params',
      params: [
        {
          name: 'kappa',
          value: 0.25,
          unit: '1/day',
          min: 0,
          max: 5,
          description: 'Relaxation rate (first guess)',
        },
        { name: 'mu', value: 2.0, unit: 'mg/L', min: 0, max: 10, description: 'Usual deficit (first guess)' },
        {
          name: 'sigma',
          value: 0.5,
          unit: 'mg/L/sqrt(day)',
          min: 0,
          max: 5,
          description: 'Noise intensity (first guess)',
        },
        { name: 'D0', value: 5, unit: 'mg/L', min: 0, max: 12, description: 'Deficit just after the storm' },
      ],
    },
    {
      id: 'pond-model',
      kind: 'model',
      name: 'Relaxing oxygen deficit',
      states: [
        { name: 'D', initial: 'D0', unit: 'mg/L', drift: 'kappa * (mu - D)', diffusion: { W: 'sigma' } },
      ],
      noises: [{ name: 'W', description: 'Weather and inflow' }],
    },
    {
      id: 'pond-observed',
      kind: 'data',
      dataset: null,
      model: 'pond-model',
      timeColumn: 'day',
      groupColumn: 'pond',
      columns: [{ column: 'deficit', state: 'D', unit: 'mg/L' }],
    },
    {
      id: 'pond-fit',
      kind: 'fit',
      data: 'pond-observed',
      model: 'pond-model',
      parameters: ['kappa', 'mu', 'sigma'],
      method: 'exact',
    },
    {
      id: 'pond-run',
      kind: 'simulation',
      name: '120 days after the storm',
      model: 'pond-model',
      t0: 0,
      t1: HORIZON,
      steps: 1200,
      paths: 2000,
      seed: 4242,
    },
    {
      id: 'pond-fan',
      kind: 'chart',
      simulation: 'pond-run',
      view: 'fan',
      state: 'D',
      title: 'Deficit: simulated band and observations',
    },
    {
      id: 'pond-late',
      kind: 'probe',
      simulation: 'pond-run',
      quantity: 'exceedance',
      state: 'D',
      time: 60,
      level: 4,
    },
  ],
});

const csv = ['day,pond,deficit', ...seriesRows()].join('\n') + '\n';
const checksum = await sha256Hex(new TextEncoder().encode(csv));
const datasetId = 'pondoxygendemo1';
const withData = {
  ...document,
  cells: document.cells.map((cell) =>
    cell.kind === 'data'
      ? { ...cell, dataset: { id: datasetId, checksum, name: 'Mill-pond readings (invented)' } }
      : cell,
  ),
};
const file = buildSheetFile({
  document: withData,
  datasets: [
    {
      id: datasetId,
      name: 'Mill-pond readings (invented)',
      originalName: 'mill-ponds.csv',
      checksum,
      content: csv,
    },
  ],
  digests: {},
  moments: {},
  digestsEngineVersion: null,
  exportedAt: new Date('2026-12-02T00:00:00Z'),
});
const target = fileURLToPath(
  new URL('../shared/examples/sheet-files/pond-oxygen.meander.json', import.meta.url),
);
writeFileSync(target, JSON.stringify(file, null, 2) + '\n');
process.stdout.write(`wrote ${target}: ${csv.split('\n').length - 2} readings\n`);
