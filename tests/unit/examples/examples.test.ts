import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { exampleSheets, findExampleSheet } from '@shared/examples/index';
import { buildSimulationPlan, checkSheet, sheetDocumentSchema, type Cell } from '@shared/sheet/index';

const examplesDir = fileURLToPath(new URL('../../../shared/examples/', import.meta.url));
const jsonFiles = readdirSync(examplesDir).filter((name) => name.endsWith('.json'));

function cellsOf<K extends Cell['kind']>(cells: Cell[], kind: K): Extract<Cell, { kind: K }>[] {
  return cells.filter((cell): cell is Extract<Cell, { kind: K }> => cell.kind === kind);
}

describe('example sheets', () => {
  it('exports every JSON file in shared/examples, under its file name', () => {
    expect(exampleSheets.map((e) => `${e.slug}.json`).sort()).toEqual([...jsonFiles].sort());
    expect(jsonFiles).toEqual(
      expect.arrayContaining([
        'harvested-fish-stock.json',
        'soil-moisture-anomaly.json',
        'grazing-two-species.json',
        'commodity-price-index.json',
      ]),
    );
    expect(findExampleSheet('soil-moisture-anomaly')?.document.title).toMatch(/Soil-moisture/);
    expect(findExampleSheet('no-such-sheet')).toBeUndefined();
  });

  for (const file of jsonFiles) {
    describe(file, () => {
      const raw: unknown = JSON.parse(readFileSync(`${examplesDir}${file}`, 'utf8'));

      it('is valid against the sheet document schema as written (no defaults needed for cell kinds)', () => {
        const parsed = sheetDocumentSchema.safeParse(raw);
        expect(parsed.success, parsed.success ? '' : JSON.stringify(parsed.error.issues)).toBe(true);
      });

      it('passes the sheet checker and builds a plan for every simulation', () => {
        const doc = sheetDocumentSchema.parse(raw);
        expect(checkSheet(doc)).toEqual([]);
        for (const sim of cellsOf(doc.cells, 'simulation')) {
          const plan = buildSimulationPlan(doc, sim.id);
          expect(plan.paths).toBe(sim.paths);
          expect(plan.model.initial.every(Number.isFinite)).toBe(true);
        }
      });

      it('uses note, params, model, simulation, chart and probe cells, with documented parameters', () => {
        const doc = sheetDocumentSchema.parse(raw);
        const kinds = new Set(doc.cells.map((cell) => cell.kind));
        for (const kind of ['note', 'params', 'model', 'simulation', 'chart', 'probe'] as const)
          expect(kinds).toContain(kind);
        const ids = doc.cells.map((cell) => cell.id);
        expect(new Set(ids).size).toBe(ids.length);
        for (const param of cellsOf(doc.cells, 'params').flatMap((cell) => cell.params)) {
          expect(param.description, param.name).toBeTruthy();
          // Plain numbers carry a unit (or are dimensionless by name) and a range for the sliders.
          if (typeof param.value === 'number') {
            expect(param.unit, param.name).toBeTruthy();
            expect(param.min, param.name).toBeDefined();
            expect(param.max, param.name).toBeDefined();
            expect(param.value).toBeGreaterThanOrEqual(param.min!);
            expect(param.value).toBeLessThanOrEqual(param.max!);
          }
        }
      });

      it('avoids the parameter sets reserved for the benchmark and for well-known textbook demos', () => {
        const doc = sheetDocumentSchema.parse(raw);
        const values = new Set(
          cellsOf(doc.cells, 'params').flatMap((cell) => cell.params.map((p) => p.value)),
        );
        expect(values.has(1.1) && values.has(0.8) && values.has(0.3)).toBe(false);
        expect(values.has(2) && values.has(1)).toBe(false);
      });
    });
  }

  it('the fish stock absorbs at its quasi-extinction level and probes the extinction probability', () => {
    const doc = findExampleSheet('harvested-fish-stock')!.document;
    const sim = cellsOf(doc.cells, 'simulation')[0]!;
    expect(sim.boundaries.N).toMatchObject({ rule: 'absorb', side: 'below' });
    expect(cellsOf(doc.cells, 'probe').some((p) => p.quantity === 'extinction')).toBe(true);
    expect(cellsOf(doc.cells, 'chart').some((c) => c.view === 'fan')).toBe(true);
  });

  it('the grazing sheet has two species, correlated noise and a phase chart', () => {
    const doc = findExampleSheet('grazing-two-species')!.document;
    const model = cellsOf(doc.cells, 'model')[0]!;
    expect(model.states).toHaveLength(2);
    expect(model.noises).toHaveLength(2);
    expect(model.correlation?.[0]?.[1]).not.toBe(0);
    expect(cellsOf(doc.cells, 'chart').some((c) => c.view === 'phase' && c.stateY !== undefined)).toBe(true);
  });

  it('the soil-moisture sheet studies Euler–Maruyama convergence and probes a drought threshold', () => {
    const doc = findExampleSheet('soil-moisture-anomaly')!.document;
    expect(cellsOf(doc.cells, 'simulation')[0]!.method).toBe('euler-maruyama');
    expect(cellsOf(doc.cells, 'study')).toHaveLength(1);
    expect(cellsOf(doc.cells, 'probe')[0]).toMatchObject({ quantity: 'subceedance', state: 'A' });
  });

  it('the price index uses Milstein, has an exact solution, a study, and says it is not financial advice', () => {
    const doc = findExampleSheet('commodity-price-index')!.document;
    expect(cellsOf(doc.cells, 'simulation')[0]!.method).toBe('milstein');
    expect(cellsOf(doc.cells, 'model')[0]!.states[0]!.exact).toBeTruthy();
    expect(cellsOf(doc.cells, 'study')[0]!.reference).toBe('exact');
    expect(cellsOf(doc.cells, 'note')[0]!.text).toMatch(/not financial advice/i);
    expect(cellsOf(doc.cells, 'probe')[0]).toMatchObject({ quantity: 'exceedance', state: 'S' });
  });
});
