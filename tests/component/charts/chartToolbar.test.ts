import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import type { ChartSpec } from '@/components/charts/chartSpec';

const plotly = vi.hoisted(() => ({
  react: vi.fn(async (element: HTMLElement) => element),
  purge: vi.fn(),
  relayout: vi.fn(async (element: HTMLElement) => element),
  downloadImage: vi.fn(async () => 'ok'),
  Plots: { resize: vi.fn() },
}));
vi.mock('plotly.js-dist-min', () => ({ default: plotly }));

import PlotlyChart from '@/components/charts/PlotlyChart.vue';
import { CHART_CONFIG } from '@/components/charts/chartTheme';

const SPEC: ChartSpec = {
  traces: [{ type: 'scatter', x: [0, 1], y: [1, 2] }],
  layout: {},
  ariaLabel: 'Mean of x over time',
  caption: 'Mean of x',
  csv: 't,x\r\n0,1\r\n1,2\r\n',
  fileName: 'mean-of-x',
};

/** Until Plotly (mocked) is loaded and the first draw is done (it waits a paint, then a task). */
async function drawn(): Promise<void> {
  for (let turn = 0; turn < 50 && plotly.react.mock.calls.length === 0; turn += 1) {
    await flushPromises();
    await new Promise((resolve) => setTimeout(resolve, 5));
  }
}

beforeEach(() => {
  plotly.react.mockClear();
  plotly.relayout.mockClear();
  plotly.downloadImage.mockClear();
});
afterEach(() => {
  document.body.innerHTML = '';
});

describe("the chart library's own toolbar", () => {
  it('is switched off, with no link or data sent anywhere', () => {
    expect(CHART_CONFIG.displayModeBar).toBe(false);
    expect(CHART_CONFIG.displaylogo).toBe(false);
    const config = CHART_CONFIG as Record<string, unknown>;
    expect(config.showLink).not.toBe(true);
    expect(config.sendData).not.toBe(true);
    expect(config.showSendToCloud).not.toBe(true);
    expect(config.showEditInChartStudio).not.toBe(true);
    expect(config.linkText).toBeUndefined();
    expect(config.plotlyServerURL).toBeUndefined();
  });

  it('is off in every draw of a chart', async () => {
    mount(PlotlyChart, { props: { spec: SPEC }, attachTo: document.body });
    await drawn();
    expect(plotly.react).toHaveBeenCalled();
    for (const call of plotly.react.mock.calls) {
      const config = (call as unknown[])[3] as Record<string, unknown>;
      expect(config.displayModeBar).toBe(false);
      expect(config.showLink).not.toBe(true);
      expect(config.sendData).not.toBe(true);
    }
  });
});

describe("Meander's chart toolbar", () => {
  it('offers four labelled actions in a named toolbar', async () => {
    const wrapper = mount(PlotlyChart, { props: { spec: SPEC }, attachTo: document.body });
    await drawn();
    const toolbar = wrapper.get('[role="toolbar"]');
    expect(toolbar.attributes('aria-label')).toBe('Chart actions: Mean of x');
    const labels = toolbar.findAll('button').map((b) => b.text());
    expect(labels).toEqual(['Reset zoom', 'PNG', 'SVG', 'CSV']);
    for (const button of toolbar.findAll('button')) expect(button.attributes('title')).toBeTruthy();
  });

  it('resets the zoom of both axes', async () => {
    const wrapper = mount(PlotlyChart, { props: { spec: SPEC }, attachTo: document.body });
    await drawn();
    await wrapper.get('[role="toolbar"] button:nth-child(1)').trigger('click');
    expect(plotly.relayout).toHaveBeenCalledWith(expect.any(HTMLElement), {
      'xaxis.autorange': true,
      'yaxis.autorange': true,
    });
  });

  it('saves PNG and SVG pictures under the chart file name', async () => {
    const wrapper = mount(PlotlyChart, { props: { spec: SPEC }, attachTo: document.body });
    await drawn();
    const buttons = wrapper.findAll('[role="toolbar"] button');
    await buttons[1]!.trigger('click');
    await buttons[2]!.trigger('click');
    expect(plotly.downloadImage.mock.calls.map((c) => (c as unknown[])[1])).toEqual([
      expect.objectContaining({ format: 'png', filename: 'mean-of-x' }),
      expect.objectContaining({ format: 'svg', filename: 'mean-of-x' }),
    ]);
  });

  it('moves between its buttons with the arrow keys', async () => {
    const wrapper = mount(PlotlyChart, { props: { spec: SPEC }, attachTo: document.body });
    await drawn();
    const buttons = wrapper.findAll('[role="toolbar"] button');
    (buttons[0]!.element as HTMLButtonElement).focus();
    await buttons[0]!.trigger('keydown', { key: 'ArrowRight' });
    expect(document.activeElement).toBe(buttons[1]!.element);
    await buttons[1]!.trigger('keydown', { key: 'ArrowLeft' });
    expect(document.activeElement).toBe(buttons[0]!.element);
    await buttons[0]!.trigger('keydown', { key: 'End' });
    expect(document.activeElement).toBe(buttons[3]!.element);
  });
});
