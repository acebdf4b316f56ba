import { afterEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import SweepCell from '@/components/cells/SweepCell.vue';
import ScenariosCell from '@/components/cells/ScenariosCell.vue';
import SweepReading from '@/components/cells/SweepReading.vue';
import ScenariosReading from '@/components/cells/ScenariosReading.vue';
import { forgetPendingText } from '@/components/cells/useFieldDraft';
import type { CellOutput } from '@/components/cells/contract';
import { checkSheet } from '@shared/sheet';
import type {
  Cell,
  ScenariosCell as ScenariosCellType,
  SheetDocument,
  SweepCell as SweepCellType,
} from '@shared/sheet/document';
import { reservoirSheet } from './fixtures';

const plotly = vi.hoisted(() => ({
  react: vi.fn(async (element: HTMLElement) => element),
  purge: vi.fn(),
  relayout: vi.fn(async (element: HTMLElement) => element),
  downloadImage: vi.fn(async () => 'ok'),
  Plots: { resize: vi.fn() },
}));
vi.mock('plotly.js-dist-min', () => ({ default: plotly }));

const mounted: VueWrapper[] = [];
afterEach(() => {
  while (mounted.length) mounted.pop()!.unmount();
  forgetPendingText('');
});

function sweepCell(change: Partial<SweepCellType> = {}): SweepCellType {
  return {
    id: 'level-sweep',
    kind: 'sweep',
    probe: 'level-probe',
    axes: [{ parameter: 'sigma', spacing: 'linear', from: 0.2, to: 0.8, count: 7, values: [] }],
    independent: false,
    ...change,
  };
}

function scenariosCell(change: Partial<ScenariosCellType> = {}): ScenariosCellType {
  return {
    id: 'level-plans',
    kind: 'scenarios',
    simulation: 'level-run',
    probes: ['level-probe'],
    scenarios: [
      { name: 'as now', overrides: {} },
      { name: 'wider release', overrides: { kappa: 1.2 } },
    ],
    baseline: 'as now',
    independent: false,
    ...change,
  };
}

/** The sheet with the cell added, and the props an editor gets, issues from the real checker. */
function props<C extends Cell>(cell: C, outputs: Record<string, CellOutput | undefined> = {}) {
  const base = reservoirSheet();
  const document: SheetDocument = { ...base, cells: [...base.cells, cell] };
  const issues = checkSheet(document).filter((issue) => issue.cellId === cell.id);
  return { cell, document, issues, outputs, stale: false, readonly: false };
}

function input(wrapper: VueWrapper, label: string) {
  const found = wrapper.find(`input[aria-label="${label}"]`);
  if (!found.exists()) throw new Error(`no input labelled "${label}"`);
  return found;
}

describe('SweepCell editor', () => {
  it('refuses a count of 0 with a clear message, keeps the typed text and emits nothing', async () => {
    const wrapper = mount(SweepCell, { props: props(sweepCell()) });
    mounted.push(wrapper);
    await input(wrapper, 'First parameter: count').setValue('0');
    expect(wrapper.text()).toMatch(/number of values must be between 1 and 200|at least 1/i);
    expect(wrapper.emitted('update')).toBeUndefined();
    await wrapper.setProps({ cell: structuredClone(sweepCell()) });
    expect((input(wrapper, 'First parameter: count').element as HTMLInputElement).value).toBe('0');
  });

  it('shows the checker’s error for a bad range and keeps the cell as it is', async () => {
    const bad = sweepCell({
      axes: [{ parameter: 'sigma', spacing: 'log', from: -1, to: 2, count: 5, values: [] }],
    });
    const wrapper = mount(SweepCell, { props: props(bad) });
    mounted.push(wrapper);
    expect(wrapper.find('[aria-label="Problems found in this cell"]').text()).toMatch(
      /logarithmic spacing needs “from” and “to” above 0/,
    );
    await input(wrapper, 'First parameter: to').setValue('two');
    expect(wrapper.text()).toMatch(/"two" is not a number/);
    expect(wrapper.emitted('update')).toBeUndefined();
  });

  it('captions the axis fields briefly inside their group and names them in full for a screen reader', () => {
    const wrapper = mount(SweepCell, { props: props(sweepCell()) });
    mounted.push(wrapper);
    const group = wrapper.find('fieldset');
    expect(group.find('legend').text()).toBe('First parameter');
    const picker = group.find('select');
    expect(picker.attributes('aria-label')).toBe('First parameter: parameter');
    expect(group.find('.cell-picker .field-label').text()).toBe('Parameter');
    expect(group.find('[role="radiogroup"]').attributes('aria-label')).toBe('First parameter: spacing');
    expect(group.text()).not.toContain('First parameter: ');
  });

  it('names a parameter that does not exist, in the picker and in the problems, losing nothing', async () => {
    const missing = sweepCell({
      axes: [{ parameter: 'rainfall', spacing: 'linear', from: 1, to: 2, count: 3, values: [] }],
    });
    const wrapper = mount(SweepCell, { props: props(missing) });
    mounted.push(wrapper);
    expect(wrapper.text()).toMatch(/no parameter “rainfall” any more: choose another/);
    expect(wrapper.find('[aria-label="Problems found in this cell"]').text()).toMatch(
      /there is no parameter 'rainfall'; the sheet's parameters are: kappa, target, sigma, L0/,
    );
    expect(wrapper.emitted('update')).toBeUndefined();
    // Changing another field keeps the axis as it was.
    await input(wrapper, 'First parameter: from').setValue('1.5');
    const updated = (wrapper.emitted('update') as [SweepCellType][]).at(-1)![0];
    expect(updated.axes[0]).toEqual({ ...missing.axes[0], from: 1.5 });
  });

  it('turns the target search on with a value and refined runs', async () => {
    const wrapper = mount(SweepCell, { props: props(sweepCell()) });
    mounted.push(wrapper);
    await wrapper.find('.sweep-target [role="checkbox"]').trigger('click');
    const updated = (wrapper.emitted('update') as [SweepCellType][]).at(-1)![0];
    expect(updated.target).toEqual({ value: 0.05, refineRuns: 6 });
  });

  it('sets and clears the paths of the refined runs', async () => {
    const cell = sweepCell({ target: { value: 0.1, refineRuns: 3 } });
    const wrapper = mount(SweepCell, { props: props(cell) });
    mounted.push(wrapper);
    await input(wrapper, 'Paths per refined run').setValue('5000');
    expect((wrapper.emitted('update') as [SweepCellType][]).at(-1)![0].target).toEqual({
      value: 0.1,
      refineRuns: 3,
      refinePaths: 5000,
    });
    await wrapper.setProps({ cell: { ...cell, target: { value: 0.1, refineRuns: 3, refinePaths: 5000 } } });
    await input(wrapper, 'Paths per refined run').setValue('');
    expect((wrapper.emitted('update') as [SweepCellType][]).at(-1)![0].target).toEqual({
      value: 0.1,
      refineRuns: 3,
    });
  });
});

describe('ScenariosCell editor', () => {
  it('refuses a second scenario of the same name and an override that is not a number', async () => {
    const wrapper = mount(ScenariosCell, { props: props(scenariosCell()) });
    mounted.push(wrapper);
    await input(wrapper, 'Scenario 2 name').setValue('as now');
    expect(wrapper.text()).toMatch(/Another scenario is already named “as now”/);
    await input(wrapper, 'wider release: sigma').setValue('lots');
    expect(wrapper.text()).toMatch(/"lots" is not a number/);
    expect(wrapper.emitted('update')).toBeUndefined();
  });

  it('shows an override of a parameter that does not exist instead of dropping it', async () => {
    const cell = scenariosCell({
      scenarios: [
        { name: 'as now', overrides: {} },
        { name: 'drier', overrides: { rainfall: 0.4 } },
      ],
    });
    const wrapper = mount(ScenariosCell, { props: props(cell) });
    mounted.push(wrapper);
    expect(wrapper.text()).toMatch(/Sets rainfall = 0.4, but the sheet has no parameter rainfall/);
    expect(wrapper.find('[aria-label="Problems found in this cell"]').text()).toMatch(
      /there is no parameter 'rainfall'/,
    );
    expect(wrapper.emitted('update')).toBeUndefined();
  });

  it('adds a scenario with a fresh name, and renaming the baseline renames it in the choice too', async () => {
    const wrapper = mount(ScenariosCell, { props: props(scenariosCell()) });
    mounted.push(wrapper);
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Add a scenario')!
      .trigger('click');
    const added = (wrapper.emitted('update') as [ScenariosCellType][]).at(-1)![0];
    expect(added.scenarios.map((s) => s.name)).toEqual(['as now', 'wider release', 'plan 3']);
    await input(wrapper, 'Scenario 1 name').setValue('today');
    const renamed = (wrapper.emitted('update') as [ScenariosCellType][]).at(-1)![0];
    expect(renamed.baseline).toBe('today');
  });
});

describe('reading views', () => {
  it('shows the target value with its interval, the table and the caution', async () => {
    const cell = sweepCell({ target: { value: 0.1, refineRuns: 2 } });
    const output: CellOutput = {
      kind: 'sweep',
      finishedAt: new Date(),
      seconds: 1,
      result: {
        parameters: ['sigma'],
        axisValues: [[0.2, 0.5]],
        probeTitle: 'P(≥ level) of L',
        commonRandomNumbers: true,
        pathsPerPoint: 1000,
        kernelInputs: ['sigma'],
        points: [0.2, 0.5].map((sigma, k) => ({
          values: [sigma],
          estimate: 0.05 + 0.1 * k,
          standardError: 0.01,
          ci: [0.03 + 0.1 * k, 0.07 + 0.1 * k] as [number, number],
          paths: 1000,
          digest: `d${k}`,
          warnings: k === 1 ? ['conditional on the 900 surviving paths'] : [],
          step: k === 0 ? null : { estimate: 0.1, pairedSE: 0.004, independentSE: 0.014 },
          error: null,
        })),
        target: {
          target: 0.1,
          bracketed: true,
          root: 0.35,
          interval: [0.31, 0.39],
          openBelow: false,
          openAbove: false,
          refined: [],
          message: 'target 0.1 met at 0.35, interval 0.31 to 0.39',
        },
      },
    };
    const wrapper = mount(SweepReading, { props: { ...props(cell), outputs: { [cell.id]: output } } });
    mounted.push(wrapper);
    await flushPromises();
    const answer = wrapper.find('[aria-label="Target search result"]');
    expect(answer.text()).toMatch(/0\.35 · interval \[0\.31, 0\.39\]/);
    expect(wrapper.find('table').text()).toMatch(/0\.004 · 0\.014/);
    // A point's warning is said with the value it belongs to.
    expect(wrapper.find('[role="alert"]').text()).toBe(
      'At sigma = 0.5: conditional on the 900 surviving paths',
    );
    expect(wrapper.text()).toMatch(/qualified review/);
  });

  it('marks a difference beyond noise and shows the independent-run error beside the paired one', async () => {
    const cell = scenariosCell();
    const probe = (estimate: number, difference: number | null) => ({
      estimate,
      standardError: 0.01,
      ci: [estimate - 0.02, estimate + 0.02] as [number, number],
      paths: 1000,
      warnings: [],
      difference:
        difference === null
          ? null
          : {
              estimate: difference,
              pairedSE: 0.002,
              independentSE: 0.014,
              ci: [difference - 0.004, difference + 0.004] as [number, number],
            },
      error: null,
    });
    const fan = [{ state: 'L', unit: 'm', times: [0, 1], q05: [1, 1], q50: [2, 2], q95: [3, 3] }];
    const output: CellOutput = {
      kind: 'scenarios',
      finishedAt: new Date(),
      seconds: 1,
      result: {
        baseline: 'as now',
        commonRandomNumbers: true,
        paths: 1000,
        probes: [{ id: 'level-probe', title: 'P(≥ level) of L' }],
        scenarios: [
          { name: 'as now', overrides: {}, digest: 'a', probes: [probe(0.3, null)], fan },
          {
            name: 'wider release',
            overrides: { kappa: 1.2 },
            digest: 'b',
            probes: [probe(0.25, -0.05)],
            fan,
          },
        ],
      },
    };
    const wrapper = mount(ScenariosReading, { props: { ...props(cell), outputs: { [cell.id]: output } } });
    mounted.push(wrapper);
    await flushPromises();
    const table = wrapper.find('table[aria-label="Scenario comparison"]');
    expect(table.text()).toMatch(/wider release/);
    expect(table.text()).toMatch(/beyond noise/);
    expect(table.text()).toMatch(/0\.014/);
  });
});
