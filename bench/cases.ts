import { findExampleSheet } from '../shared/examples/index';
import { sheetDocumentSchema, type SheetDocument } from '../shared/sheet/index';

/**
 * Sheets the benchmark runs. The OU case uses the reference programs' model and values
 * (../shared/bench/README.md) so the ratios compare like with like; the other cases run the
 * example sheets' own simulations.
 */
export const OU_PATHS = 10_000;
export const OU_STEPS = 1_000;

export function ouBenchmarkSheet(): SheetDocument {
  return sheetDocumentSchema.parse({
    schemaVersion: 1,
    title: 'Benchmark: Ornstein–Uhlenbeck, Euler–Maruyama',
    cells: [
      {
        id: 'ou-params',
        kind: 'params',
        params: [
          { name: 'theta', value: 1.1 },
          { name: 'mu', value: 0.8 },
          { name: 'sigma', value: 0.3 },
          { name: 'X0', value: 2 },
        ],
      },
      {
        id: 'ou-model',
        kind: 'model',
        states: [{ name: 'X', initial: 'X0', drift: 'theta * (mu - X)', diffusion: { W: 'sigma' } }],
        noises: [{ name: 'W' }],
      },
      {
        id: 'ou-run',
        kind: 'simulation',
        model: 'ou-model',
        method: 'euler-maruyama',
        t0: 0,
        t1: 5,
        steps: OU_STEPS,
        paths: OU_PATHS,
        seed: 42,
        // Like the C and numpy references, keep only the start and the end (mean and variance at T);
        // the statistics at 101 saved times that a sheet keeps by default are extra work they do not do.
        saveCount: 2,
        samplePaths: 0,
      },
    ],
  });
}

export interface BenchSheet {
  doc: SheetDocument;
  simulationId: string;
}

function exampleSimulation(slug: string): BenchSheet {
  const example = findExampleSheet(slug);
  if (!example) throw new Error(`no example sheet "${slug}"`);
  const sim = example.document.cells.find((cell) => cell.kind === 'simulation');
  if (!sim) throw new Error(`example sheet "${slug}" has no simulation cell`);
  return { doc: example.document, simulationId: sim.id };
}

export const benchSheets = {
  ou: (): BenchSheet => ({ doc: ouBenchmarkSheet(), simulationId: 'ou-run' }),
  grazing: () => exampleSimulation('grazing-two-species'),
  gbm: () => exampleSimulation('commodity-price-index'),
};
