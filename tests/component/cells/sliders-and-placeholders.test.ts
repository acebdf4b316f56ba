import { afterEach, describe, expect, it } from 'vitest';
import { mount, type VueWrapper } from '@vue/test-utils';
import ParamsCell from '@/components/cells/ParamsCell.vue';
import ProfileForm from '@/views/account/ProfileForm.vue';
import type { ParamsCell as ParamsCellType } from '@shared/sheet/document';
import { cellOf, editorProps, reservoirSheet } from './fixtures';
import { createPinia, setActivePinia } from 'pinia';

const mounted: VueWrapper[] = [];
afterEach(() => {
  while (mounted.length) mounted.pop()!.unmount();
});

function paramsWith(value: number): { wrapper: VueWrapper; slider: HTMLInputElement } {
  const sheet = reservoirSheet();
  const params = cellOf(sheet, 'pars', 'params');
  const cell: ParamsCellType = {
    ...params,
    params: [{ ...params.params[0]!, value }, ...params.params.slice(1)],
  };
  const wrapper = mount(ParamsCell, { props: editorProps(sheet, cell) });
  mounted.push(wrapper);
  return { wrapper, slider: wrapper.find('input[type="range"]').element as HTMLInputElement };
}

describe('parameter sliders', () => {
  it('sit exactly at a value that is not on a round grid', () => {
    const { slider } = paramsWith(0.4537);
    expect(slider.value).toBe('0.4537');
    expect(slider.getAttribute('step')).toBe('any');
  });

  it('use a round step that divides the range when the value is on it', () => {
    const { slider } = paramsWith(0.8);
    expect(slider.value).toBe('0.8');
    const step = Number(slider.getAttribute('step'));
    // kappa's range is [0, 5]: the step must reach both ends exactly.
    expect(Number.isInteger(Math.round((5 / step) * 1e9) / 1e9)).toBe(true);
    expect(5 / step).toBeGreaterThanOrEqual(100);
  });
});

describe('placeholders', () => {
  it('the parameter table shows no generic placeholder', () => {
    const { wrapper } = paramsWith(0.8);
    expect(wrapper.html()).not.toMatch(/Please (Input|Select)/);
  });

  it('the profile form shows no generic placeholder', () => {
    setActivePinia(createPinia());
    const wrapper = mount(ProfileForm, { global: { plugins: [createPinia()] } });
    mounted.push(wrapper);
    expect(wrapper.html()).not.toMatch(/Please (Input|Select)/);
  });
});
