import { sheetDocumentSchema, type SheetDocument } from '@shared/sheet/index';

/**
 * Small sheets for the sweep and scenarios tests: one parameter cell, one model, one simulation,
 * probes and the cell under test. Parameter values and models are our own.
 */
export function sheet(options: {
  params: Record<string, number | string>;
  drift: string;
  diffusion: string;
  initial: string;
  t1: number;
  steps: number;
  paths: number;
  seed?: number;
  probes: Record<string, unknown>[];
  cells?: Record<string, unknown>[];
  boundaries?: Record<string, unknown>;
}): SheetDocument {
  return sheetDocumentSchema.parse({
    schemaVersion: 1,
    title: 'Sweep test sheet',
    cells: [
      {
        id: 'p',
        kind: 'params',
        params: Object.entries(options.params).map(([name, value]) => ({ name, value })),
      },
      {
        id: 'm',
        kind: 'model',
        states: [
          { name: 'X', initial: options.initial, drift: options.drift, diffusion: { W: options.diffusion } },
        ],
        noises: [{ name: 'W' }],
        calculus: 'ito',
      },
      {
        id: 'sim',
        kind: 'simulation',
        model: 'm',
        t1: options.t1,
        steps: options.steps,
        paths: options.paths,
        seed: options.seed ?? 7301,
        saveCount: 11,
        samplePaths: 0,
        boundaries: options.boundaries ?? {},
      },
      ...options.probes.map((probe) => ({ kind: 'probe', simulation: 'sim', state: 'X', ...probe })),
      ...(options.cells ?? []),
    ],
  });
}
