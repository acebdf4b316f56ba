import { afterEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import NoteCell from '@/components/cells/NoteCell.vue';
import ParamsCell from '@/components/cells/ParamsCell.vue';
import ModelCell from '@/components/cells/ModelCell.vue';
import SimulationCell from '@/components/cells/SimulationCell.vue';
import type { Cell } from '@shared/sheet/document';
import { forgetPendingText } from '@/components/cells/useFieldDraft';
import { cellOf, editorProps, reservoirSheet } from './fixtures';

// CodeMirror is exercised through its diagnostics function (expressionDiagnostics.test.ts); here
// the editor module is replaced, so the component tests stay light in jsdom.
vi.mock('@/components/cells/expressionEditor', () => ({
  createExpressionEditor: () => ({ setText() {}, setReadonly() {}, relint() {}, destroy() {} }),
}));

const mounted: VueWrapper[] = [];
afterEach(() => {
  while (mounted.length) mounted.pop()!.unmount();
  // Typed-but-unstored text outlives a component on purpose; tests start without any.
  forgetPendingText('');
});

function input(wrapper: VueWrapper, label: string) {
  const found = wrapper.find(`input[aria-label="${label}"], textarea[aria-label="${label}"]`);
  if (!found.exists()) throw new Error(`no input labelled "${label}"`);
  return found;
}

function lastUpdate(wrapper: VueWrapper): Cell | undefined {
  const events = wrapper.emitted('update') as [Cell][] | undefined;
  return events?.at(-1)?.[0];
}

describe('NoteCell', () => {
  it('shows sanitised markdown and toggles a textarea with "Edit note" and "Done"', async () => {
    const sheet = reservoirSheet();
    const note = { ...cellOf(sheet, 'intro', 'note'), text: 'Level <img src=x onerror=alert(1)> *rises*' };
    const wrapper = mount(NoteCell, { props: editorProps(sheet, note) });
    mounted.push(wrapper);
    expect(wrapper.find('img').exists()).toBe(false);
    expect(wrapper.find('em').text()).toBe('rises');
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Edit note')!
      .trigger('click');
    const textarea = input(wrapper, 'Note text');
    await textarea.setValue('# New heading');
    expect(lastUpdate(wrapper)).toEqual({ ...note, text: '# New heading' });
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Done')!
      .trigger('click');
    expect(wrapper.find('textarea').exists()).toBe(false);
  });
});

describe('ParamsCell', () => {
  it('shows the error of a bad name and keeps the typed text through re-render and re-mount', async () => {
    const sheet = reservoirSheet();
    const cell = cellOf(sheet, 'pars', 'params');
    const wrapper = mount(ParamsCell, { props: editorProps(sheet, cell) });
    mounted.push(wrapper);
    const name = input(wrapper, 'name of parameter 1 (kappa)');
    await name.setValue('2kappa');
    expect(wrapper.text()).toMatch(/"2kappa" is not a valid name/);
    expect(wrapper.emitted('update')).toBeUndefined();

    // The page re-renders with a new (equal) cell object: the typed text stays.
    await wrapper.setProps({ cell: structuredClone(cell) });
    expect((input(wrapper, 'name of parameter 1 (kappa)').element as HTMLInputElement).value).toBe('2kappa');

    // Another field changes elsewhere: still kept.
    const changed = { ...cell, params: cell.params.map((p, i) => (i === 1 ? { ...p, value: 3.3 } : p)) };
    await wrapper.setProps({ cell: changed });
    expect((input(wrapper, 'name of parameter 1 (kappa)').element as HTMLInputElement).value).toBe('2kappa');

    // A fresh mount of the same cell (the page re-created the card) shows it too.
    wrapper.unmount();
    mounted.pop();
    const again = mount(ParamsCell, { props: editorProps(sheet, changed) });
    mounted.push(again);
    expect((input(again, 'name of parameter 1 (kappa)').element as HTMLInputElement).value).toBe('2kappa');
    expect(again.text()).toMatch(/not a valid name/);
  });

  it('flags max below min and a value that is neither a number nor an expression', async () => {
    const sheet = reservoirSheet();
    const cell = cellOf(sheet, 'pars', 'params');
    const wrapper = mount(ParamsCell, { props: editorProps(sheet, cell) });
    mounted.push(wrapper);
    await input(wrapper, 'max of parameter 1 (kappa)').setValue('-1');
    expect(wrapper.text()).toMatch(/Max \(-1\) is below min \(0\)/);
    await input(wrapper, 'value of parameter 2 (target)').setValue('3,2');
    expect(wrapper.text()).toMatch(/Not a number, and not a valid expression/);
    expect((input(wrapper, 'value of parameter 2 (target)').element as HTMLInputElement).value).toBe('3,2');
  });

  it('emits a new cell for a valid edit without touching the given one, and adds a row', async () => {
    const sheet = reservoirSheet();
    const cell = cellOf(sheet, 'pars', 'params');
    const before = structuredClone(cell);
    const wrapper = mount(ParamsCell, { props: editorProps(sheet, cell) });
    mounted.push(wrapper);
    await input(wrapper, 'value of parameter 3 (sigma)').setValue('0.5');
    expect(lastUpdate(wrapper)).toMatchObject({ params: [{}, {}, { name: 'sigma', value: 0.5 }, {}] });
    expect(cell).toEqual(before);
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Add parameter')!
      .trigger('click');
    expect((lastUpdate(wrapper) as typeof cell).params).toHaveLength(5);
  });

  it('puts a labelled slider under a row with min and max', () => {
    const sheet = reservoirSheet();
    const wrapper = mount(ParamsCell, { props: editorProps(sheet, cellOf(sheet, 'pars', 'params')) });
    mounted.push(wrapper);
    const slider = wrapper.find('input[type="range"]');
    expect(slider.attributes('aria-label')).toBe('Slide the value of parameter 1 (kappa)');
    expect(wrapper.findAll('input[type="range"]')).toHaveLength(1);
  });
});

describe('ModelCell', () => {
  it('marks a bad drift before anything runs', async () => {
    const sheet = reservoirSheet();
    const model = cellOf(sheet, 'level-model', 'model');
    const bad = { ...model, states: [{ ...model.states[0]!, drift: 'kappa * (target - L) ^ 2' }] };
    const wrapper = mount(ModelCell, { props: editorProps(sheet, bad) });
    mounted.push(wrapper);
    await flushPromises();
    const problems = wrapper.find('[aria-label="Problems in Drift of L"]');
    expect(problems.exists()).toBe(true);
    expect(problems.text()).toMatch(/\*\*/);
    expect(wrapper.find('[aria-label="Problems in Diffusion of L on noise R"]').exists()).toBe(false);
  });

  it('keeps a bad state name with its error through a re-render', async () => {
    const sheet = reservoirSheet();
    const model = cellOf(sheet, 'level-model', 'model');
    const wrapper = mount(ModelCell, { props: editorProps(sheet, model) });
    mounted.push(wrapper);
    await input(wrapper, 'Name of state 1').setValue('kappa');
    expect(wrapper.text()).toMatch(/"kappa" is already used/);
    await wrapper.setProps({ cell: { ...model, name: 'Reservoir level (renamed)' } });
    expect((input(wrapper, 'Name of state 1').element as HTMLInputElement).value).toBe('kappa');
    expect(wrapper.emitted('update')).toBeUndefined();
  });

  it('shows the correlation grid once there are two noise sources and checks it', async () => {
    const sheet = reservoirSheet();
    const model = cellOf(sheet, 'level-model', 'model');
    const two = {
      ...model,
      noises: [...model.noises, { name: 'E' }],
      correlation: [
        [1, 0],
        [0, 1],
      ],
    };
    const wrapper = mount(ModelCell, { props: editorProps(sheet, two) });
    mounted.push(wrapper);
    await input(wrapper, 'Correlation of R and E').setValue('1.5');
    expect(wrapper.text()).toMatch(/Between −1 and 1/);
    await input(wrapper, 'Correlation of R and E').setValue('0.4');
    expect(lastUpdate(wrapper)).toMatchObject({
      correlation: [
        [1, 0.4],
        [0.4, 1],
      ],
    });
  });
});

describe('SimulationCell', () => {
  it('shows the estimated cost of the run before it runs', () => {
    const sheet = reservoirSheet();
    const wrapper = mount(SimulationCell, {
      props: editorProps(sheet, cellOf(sheet, 'level-run', 'simulation')),
    });
    mounted.push(wrapper);
    const cost = wrapper.find('[aria-label="Estimated cost of the run"]');
    // 20 000 paths × 3000 steps = 60 million path-steps; 20 000 × 61 saved times × 1 state × 8 bytes.
    expect(cost.text()).toMatch(/60\.0 million path-steps/);
    expect(cost.text()).toMatch(/9\.76 MB/);
  });

  it('warns when the saved values would need more than about 1 GB', () => {
    const sheet = reservoirSheet();
    const big = { ...cellOf(sheet, 'level-run', 'simulation'), paths: 2_000_000, saveCount: 101 };
    const wrapper = mount(SimulationCell, { props: editorProps(sheet, big) });
    mounted.push(wrapper);
    expect(wrapper.find('[aria-label="Estimated cost of the run"]').text()).toMatch(/1\.62 GB/);
  });

  it('keeps bad paths text with its error, and gives a new seed on request', async () => {
    const sheet = reservoirSheet();
    const cell = cellOf(sheet, 'level-run', 'simulation');
    const wrapper = mount(SimulationCell, { props: editorProps(sheet, cell) });
    mounted.push(wrapper);
    await input(wrapper, 'Paths').setValue('20k');
    expect(wrapper.text()).toMatch(/"20k" is not a number/);
    await wrapper.setProps({ cell: { ...cell, seed: 9 } });
    expect((input(wrapper, 'Paths').element as HTMLInputElement).value).toBe('20k');
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'New seed')!
      .trigger('click');
    const updated = lastUpdate(wrapper) as typeof cell;
    expect(updated.paths).toBe(20000);
    expect(Number.isInteger(updated.seed) && updated.seed >= 0 && updated.seed <= 0xffffffff).toBe(true);
  });
});
