import { describe, expect, it } from 'vitest';
import { sheetDocumentSchema, type SheetDocument, type SheetDocumentInput } from '@shared/sheet/document';
import { diffSheets } from '@shared/sheet/diff';

/** An invented sheet: a harvested shrimp population with logistic growth and noise. */
function shrimpSheet(): SheetDocumentInput {
  return {
    schemaVersion: 1,
    title: 'Shrimp pond',
    cells: [
      { id: 'intro', kind: 'note', text: 'Shrimp biomass in a farm pond.' },
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'r', value: 0.8 },
          { name: 'K', value: 40, unit: 't' },
          { name: 'h', value: 0.1 },
          { name: 'sigma', value: 0.2 },
        ],
      },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'N', initial: '10', drift: 'r*N*(1-N/K)', diffusion: { W: 'sigma*N' } }],
        noises: [{ name: 'W' }],
      },
      { id: 'run', kind: 'simulation', model: 'm', t1: 10, steps: 500, paths: 10000, seed: 17 },
      { id: 'fan', kind: 'chart', simulation: 'run', view: 'fan', state: 'N' },
    ],
  };
}

const parse = (input: SheetDocumentInput): SheetDocument => sheetDocumentSchema.parse(input);

/** A copy of the sheet with `change` applied to its plain data. */
function edited(change: (document: SheetDocument) => void): SheetDocument {
  const document = structuredClone(parse(shrimpSheet()));
  change(document);
  return parse(document);
}

const cellOf = <Kind extends SheetDocument['cells'][number]['kind']>(document: SheetDocument, kind: Kind) =>
  document.cells.find((cell) => cell.kind === kind) as Extract<
    SheetDocument['cells'][number],
    { kind: Kind }
  >;

describe('diffSheets', () => {
  it('finds nothing between a version and itself', () => {
    const diff = diffSheets(parse(shrimpSheet()), parse(shrimpSheet()));
    expect(diff).toEqual({ title: null, cells: [], same: true });
  });

  it('writes a changed parameter value with both numbers alike', () => {
    const after = edited((document) => {
      cellOf(document, 'params').params[3]!.value = 0.35;
    });
    const diff = diffSheets(parse(shrimpSheet()), after);
    expect(diff.cells).toEqual([
      { cellId: 'p', cellKind: 'params', change: 'kept', moved: null, details: ['σ: 0.20 → 0.35'] },
    ]);
  });

  it('names a renamed parameter as a rename, not a removal and an addition', () => {
    const after = edited((document) => {
      cellOf(document, 'params').params[2]!.name = 'harvest';
    });
    expect(diffSheets(parse(shrimpSheet()), after).cells[0]!.details).toEqual([
      'parameter renamed: h → harvest',
    ]);
  });

  it('shows a changed drift expression before and after', () => {
    const after = edited((document) => {
      cellOf(document, 'model').states[0]!.drift = 'r*N*(1-N/K) - h*N';
    });
    expect(diffSheets(parse(shrimpSheet()), after).cells[0]!.details).toEqual([
      'drift of N: `r*N*(1-N/K)` → `r*N*(1-N/K) - h*N`',
    ]);
  });

  it('lists an added noise source and its diffusion term', () => {
    const after = edited((document) => {
      const model = cellOf(document, 'model');
      model.noises.push({ name: 'Rain' });
      model.states[0]!.diffusion.Rain = '0.05*N';
    });
    expect(diffSheets(parse(shrimpSheet()), after).cells[0]!.details).toEqual([
      'diffusion of N on Rain: (none) → `0.05*N`',
      'new noise source Rain',
    ]);
  });

  it('groups thousands in path counts and names schemes by their published names', () => {
    const after = edited((document) => {
      const run = cellOf(document, 'simulation');
      run.paths = 50000;
      run.method = 'milstein';
    });
    expect(diffSheets(parse(shrimpSheet()), after).cells[0]!.details).toEqual([
      'method: Euler–Maruyama → Milstein',
      'paths: 10,000 → 50,000',
    ]);
  });

  it('reports a moved cell with its old and new place, and only that cell', () => {
    const after = edited((document) => {
      const [chart] = document.cells.splice(4, 1);
      document.cells.splice(1, 0, chart!);
    });
    expect(diffSheets(parse(shrimpSheet()), after).cells).toEqual([
      { cellId: 'fan', cellKind: 'chart', change: 'kept', moved: { from: 4, to: 1 }, details: [] },
    ]);
  });

  it('reports added and removed cells where they are, and a new title', () => {
    const after = edited((document) => {
      document.title = 'Shrimp pond, harvested';
      document.cells.splice(0, 1);
      document.cells.push({
        id: 'risk',
        kind: 'probe',
        simulation: 'run',
        quantity: 'extinction',
        state: 'N',
        level: 1,
      });
    });
    const diff = diffSheets(parse(shrimpSheet()), after);
    expect(diff.title).toBe('title: "Shrimp pond" → "Shrimp pond, harvested"');
    expect(diff.cells.map((cell) => [cell.cellId, cell.change])).toEqual([
      ['intro', 'removed'],
      ['risk', 'added'],
    ]);
    expect(diff.same).toBe(false);
  });

  it('writes a parameter that became an expression in backticks', () => {
    const after = edited((document) => {
      cellOf(document, 'params').params[1]!.value = '50 * r';
    });
    expect(diffSheets(parse(shrimpSheet()), after).cells[0]!.details).toEqual(['K: 40 → `50 * r`']);
  });
});
