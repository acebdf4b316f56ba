import { afterEach, describe, expect, it } from 'vitest';
import { mount, type VueWrapper } from '@vue/test-utils';
import FitCell from '@/components/cells/FitCell.vue';
import { sheetEditsKey } from '@/components/cells/contract';
import { forgetPendingText } from '@/components/cells/useFieldDraft';
import type { FitResult } from '@shared/fit/problem';
import { checkSheet } from '@shared/sheet';
import type { Cell, FitCell as FitCellType, SheetDocument } from '@shared/sheet/document';
import { cellOf, editorProps, reservoirSheet } from './fixtures';

/** The fit editor: choices that cannot work are explained in plain words, and nothing is lost. */
function fitSheet(change: Partial<FitCellType> = {}, drift = 'kappa * (target - L)'): SheetDocument {
  const base = reservoirSheet();
  const cells = base.cells.map((cell) =>
    cell.kind === 'model' ? { ...cell, states: cell.states.map((s) => ({ ...s, drift })) } : cell,
  );
  return {
    ...base,
    cells: [
      ...cells,
      {
        id: 'levels',
        kind: 'data',
        dataset: null,
        model: 'level-model',
        timeColumn: 'day',
        columns: [{ column: 'level', state: 'L', unit: 'm' }],
      },
      {
        id: 'level-fit',
        kind: 'fit',
        data: 'levels',
        model: 'level-model',
        parameters: ['kappa', 'target', 'sigma'],
        method: 'exact',
        starts: 1,
        subSteps: 8,
        draws: 32,
        seed: 1,
        ...change,
      },
    ],
  };
}

const mounted: VueWrapper[] = [];
afterEach(() => {
  while (mounted.length) mounted.pop()!.unmount();
  forgetPendingText('');
});

function mountFit(
  doc: SheetDocument,
  outputs = {},
  edits?: { mayEdit(): boolean; useFitEstimates(id: string): number },
) {
  const cell = cellOf(doc, 'level-fit', 'fit');
  const issues = checkSheet(doc)
    .filter((issue) => issue.cellId === cell.id)
    .map(({ path, message }) => ({ path, message }));
  const wrapper = mount(FitCell, {
    props: { ...editorProps(doc, cell, outputs), issues },
    global: { provide: edits ? { [sheetEditsKey as symbol]: edits } : {} },
  });
  mounted.push(wrapper);
  return wrapper;
}

const lastUpdate = (wrapper: VueWrapper) => (wrapper.emitted('update') as [Cell][] | undefined)?.at(-1)?.[0];

describe('FitCell', () => {
  it('says the exact likelihood is available for a linear model', () => {
    const wrapper = mountFit(fitSheet());
    expect(wrapper.text()).toMatch(
      /linear with constant coefficients: the exact Gaussian transition is available/,
    );
    expect(wrapper.text()).not.toMatch(/not available/);
  });

  it('explains why the exact likelihood does not apply to a nonlinear drift, and keeps the other choices', () => {
    const doc = fitSheet({}, 'kappa * L * (target - L)');
    const wrapper = mountFit(doc);
    expect(wrapper.text()).toMatch(
      /Exact likelihood not available: the drift of L is not linear in the states/,
    );
    // The checker's message sits beside the field; the parameters picked stay as they were.
    expect(wrapper.text()).toMatch(/pick the Euler pseudo-likelihood or the simulated likelihood/);
    const boxes = wrapper.findAll('input[type="checkbox"]');
    expect(boxes.map((b) => (b.element as HTMLInputElement).checked)).toEqual([true, true, true]);
  });

  it('will not let a parameter defined by an expression be picked, and says why', () => {
    const doc = fitSheet({ parameters: ['kappa', 'sigma'] });
    const params = doc.cells.find((c) => c.kind === 'params');
    if (params?.kind === 'params') params.params[1] = { ...params.params[1]!, value: '3 * L0' };
    const wrapper = mountFit(doc);
    const target = wrapper.find('input[aria-label="Estimate target"]');
    expect((target.element as HTMLInputElement).disabled).toBe(true);
    expect(wrapper.text()).toMatch(/defined by an expression: cannot be estimated/);
  });

  it('refuses a number of starts out of range with a plain message and stores nothing', async () => {
    const wrapper = mountFit(fitSheet());
    const starts = wrapper.find('input[aria-label="Optimiser starts"]');
    await starts.setValue('0');
    await starts.trigger('change');
    expect(wrapper.text()).toMatch(/The number of starts must be between 1 and 20\./);
    expect(wrapper.emitted('update')).toBeUndefined();
    expect((starts.element as HTMLInputElement).value).toBe('0');
  });

  it('keeps the sheet order when a parameter is unticked and ticked again', async () => {
    const wrapper = mountFit(fitSheet());
    await wrapper.find('input[aria-label="Estimate kappa"]').setValue(false);
    expect((lastUpdate(wrapper) as FitCellType).parameters).toEqual(['target', 'sigma']);
  });

  it('shows the estimates and offers "Use these values" when the page allows edits', async () => {
    const result: FitResult = {
      method: 'exact',
      ok: true,
      estimates: [
        {
          name: 'kappa',
          unit: '1/day',
          estimate: 0.41,
          standardError: 0.05,
          ci: [0.312, 0.508],
          atBound: false,
        },
      ],
      logLikelihood: -40.2,
      aic: 86.4,
      observations: 60,
      transitions: 59,
      groups: 1,
      evaluations: 300,
      converged: true,
      convergence: 'converged: a fresh search from the best point found nothing better',
      advice: [],
      warnings: [],
      residuals: {
        count: 59,
        ksStatistic: 0.08,
        ksPValue: 0.81,
        basis: 'the exact Gaussian transition',
        qq: [],
      },
      startsBelowBest: 0,
      seconds: 0.1,
    };
    const used: string[] = [];
    const wrapper = mountFit(
      fitSheet(),
      { 'level-fit': { kind: 'fit', result, finishedAt: new Date(), seconds: 0.1 } },
      { mayEdit: () => true, useFitEstimates: (id) => (used.push(id), 1) },
    );
    expect(wrapper.text()).toMatch(/kappa/);
    expect(wrapper.text()).toMatch(/kappa0\.4100\.050/);
    expect(wrapper.text()).toMatch(/0\.312 to 0\.508/);
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Use these values')!
      .trigger('click');
    expect(used).toEqual(['level-fit']);
  });

  it('says why a fit failed and what to try', () => {
    const failed: FitResult = {
      method: 'euler',
      ok: false,
      estimates: [],
      logLikelihood: Number.NaN,
      aic: Number.NaN,
      observations: 10,
      transitions: 9,
      groups: 1,
      evaluations: 1,
      converged: false,
      convergence: 'failed: the likelihood cannot be computed at the starting values',
      advice: ['move the starting values in the parameters cell closer to what the data suggest'],
      warnings: [],
      residuals: { count: 0, ksStatistic: null, ksPValue: null, basis: '', qq: [] },
      startsBelowBest: 0,
      seconds: 0,
    };
    const wrapper = mountFit(fitSheet({ method: 'euler' }), {
      'level-fit': { kind: 'fit', result: failed, finishedAt: new Date(), seconds: 0 },
    });
    expect(wrapper.text()).toMatch(
      /The fit failed: the likelihood cannot be computed at the starting values/,
    );
    expect(wrapper.text()).toMatch(/Try: move the starting values/);
    expect(wrapper.find('button').exists() && wrapper.text().includes('Use these values')).toBe(false);
  });
});
