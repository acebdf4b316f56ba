import { sheetDocumentSchema, type SheetDocument, type SheetDocumentInput } from '@shared/sheet';

type CellInput = SheetDocumentInput['cells'][number];

/**
 * A small Ornstein–Uhlenbeck sheet of our own: a reservoir level anomaly x reverting to mu at
 * rate theta with noise amplitude sigma. Values invented for the tests.
 */
export function ouCells(): CellInput[] {
  return [
    { id: 'intro', kind: 'note', text: 'Reservoir level anomaly.' },
    {
      id: 'p',
      kind: 'params',
      params: [
        { name: 'theta', value: 1.3, min: 0, max: 10 },
        { name: 'mu', value: 0.4 },
        { name: 'sigma', value: 0.25 },
        { name: 'x0', value: '2 * mu + 0.9' },
      ],
    },
    {
      id: 'm',
      kind: 'model',
      states: [
        {
          name: 'x',
          initial: 'x0',
          unit: 'm',
          drift: 'theta * (mu - x)',
          diffusion: { W: 'sigma' },
        },
      ],
      noises: [{ name: 'W' }],
    },
    { id: 'run', kind: 'simulation', model: 'm', t1: 3, stepSize: 0.01, paths: 500, seed: 7 },
    { id: 'fan', kind: 'chart', simulation: 'run', view: 'fan', state: 'x' },
    { id: 'high', kind: 'probe', simulation: 'run', quantity: 'exceedance', state: 'x', level: 1 },
  ];
}

export function sheet(cells: CellInput[]): SheetDocument {
  return sheetDocumentSchema.parse({ schemaVersion: 1, title: 'Test sheet', cells });
}

export function ouSheet(): SheetDocument {
  return sheet(ouCells());
}

/** The OU sheet with one cell replaced (by id) or appended. */
export function ouWith(...replacements: CellInput[]): SheetDocument {
  const cells = ouCells();
  for (const replacement of replacements) {
    const at = cells.findIndex((c) => c.id === replacement.id);
    if (at >= 0) cells[at] = replacement;
    else cells.push(replacement);
  }
  return sheet(cells);
}

export function modelCell(overrides: Partial<Extract<CellInput, { kind: 'model' }>> = {}): CellInput {
  const base = ouCells().find((c) => c.id === 'm');
  return { ...(base as Extract<CellInput, { kind: 'model' }>), ...overrides };
}

export function simulationCell(
  overrides: Partial<Extract<CellInput, { kind: 'simulation' }>> = {},
): CellInput {
  const base = ouCells().find((c) => c.id === 'run');
  return { ...(base as Extract<CellInput, { kind: 'simulation' }>), ...overrides };
}
