import { describe, expect, it } from 'vitest';
import type { ModelCell, SheetDocument } from '@shared/sheet/document';
import { modelEquations } from '@/components/cells/modelEquations';

function sheetWith(model: ModelCell): SheetDocument {
  return {
    schemaVersion: 1,
    title: 'Peat moisture',
    cells: [
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'κ', value: 0.7 },
          { name: 'm', value: 0.1 },
          { name: 's', value: 0.05 },
        ],
      },
      model,
    ],
  };
}

const MODEL: ModelCell = {
  id: 'm1',
  kind: 'model',
  states: [
    { name: 'Y', initial: '2 * m', unit: 'mm', drift: 'κ * (m - Y)', diffusion: { W: 's', V: '-s * Y' } },
  ],
  noises: [{ name: 'W' }, { name: 'V' }],
  calculus: 'ito',
};

describe('modelEquations', () => {
  it('writes each state as dX = drift dt + diffusion dW, with its unit', () => {
    const [state] = modelEquations(MODEL, sheetWith(MODEL));
    expect(state).toEqual({
      name: 'Y',
      unit: 'mm',
      equation: { ok: true, tex: String.raw`dY = \kappa\,\left(m - Y\right)\,dt + s\,dW - s\,Y\,dV` },
      initial: { ok: true, tex: String.raw`Y(t_0) = 2\,m` },
    });
  });

  it('writes the Stratonovich form with ∘ dW', () => {
    const model: ModelCell = { ...MODEL, calculus: 'stratonovich' };
    const [state] = modelEquations(model, sheetWith(model));
    expect(state!.equation).toEqual({
      ok: true,
      tex: String.raw`dY = \kappa\,\left(m - Y\right)\,dt + s\circ dW - s\,Y\circ dV`,
    });
  });

  it('never typesets a coefficient that does not check: it returns the text and the problem', () => {
    const model: ModelCell = {
      ...MODEL,
      states: [{ ...MODEL.states[0]!, drift: 'κ * (m - Y) + \\href{x}{y}' }],
    };
    const [state] = modelEquations(model, sheetWith(model));
    expect(state!.equation.ok).toBe(false);
    if (!state!.equation.ok) {
      expect(state!.equation.text).toContain('\\href');
      expect(state!.equation.problem).toMatch(/^drift: /);
    }
  });
});
