import { afterEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import ProbeCell from '@/components/cells/ProbeCell.vue';
import ChartCell from '@/components/cells/ChartCell.vue';
import StudyCell from '@/components/cells/StudyCell.vue';
import SimulationCell from '@/components/cells/SimulationCell.vue';
import type { CellOutput } from '@/components/cells/contract';
import type { StudyResult } from '@shared/engine';
import { cellOf, editorProps, fakeRun, reservoirSheet } from './fixtures';

/** Charts draw in the first task after the next paint (PlotlyChart.vue): let it run. */
async function chartDrawn(): Promise<void> {
  await flushPromises();
  await new Promise((resolve) => requestAnimationFrame(() => setTimeout(resolve, 0)));
  await flushPromises();
}

const plotly = vi.hoisted(() => ({
  react: vi.fn(async (element: HTMLElement) => element),
  purge: vi.fn(),
  downloadImage: vi.fn(async () => 'ok'),
  Plots: { resize: vi.fn() },
}));
vi.mock('plotly.js-dist-min', () => ({ default: plotly }));

const mounted: VueWrapper[] = [];
afterEach(() => {
  while (mounted.length) mounted.pop()!.unmount();
  vi.clearAllMocks();
});

const finishedAt = new Date('2026-03-01T10:00:00Z');

function simulationOutput(options?: Parameters<typeof fakeRun>[0]): CellOutput {
  const { plan, result } = fakeRun(options);
  return { kind: 'simulation', plan, result, engineVersion: 1, finishedAt, seconds: 1.25 };
}

describe('ProbeCell', () => {
  it('shows the estimate ± its standard error, the 95 % interval, the paths and the caution', () => {
    const sheet = reservoirSheet();
    const probe = cellOf(sheet, 'level-probe', 'probe');
    const outputs: Record<string, CellOutput> = {
      'level-probe': {
        kind: 'probe',
        estimate: { estimate: 0.08215, standardError: 0.001941, ci: [0.07846, 0.08604], paths: 20000 },
        finishedAt,
      },
    };
    const wrapper = mount(ProbeCell, { props: editorProps(sheet, probe, outputs) });
    mounted.push(wrapper);
    const answer = wrapper.find('[aria-label="Probe result"]');
    expect(answer.attributes('role')).toBe('status');
    expect(answer.text()).toMatch(/0\.0822\s*±\s*0\.0019/);
    expect(answer.text()).toMatch(/95 % interval \[0\.0785, 0\.0860\]/);
    expect(answer.text()).toMatch(/20,000 paths/);
    expect(answer.text()).toMatch(/P\(L ≥ 4\) at t = 30/);
    expect(wrapper.text()).toMatch(/need independent validation and qualified review/);
  });

  it('asks for a level where the quantity needs one and keeps bad text', async () => {
    const sheet = reservoirSheet();
    const probe = cellOf(sheet, 'level-probe', 'probe');
    const wrapper = mount(ProbeCell, { props: editorProps(sheet, probe) });
    mounted.push(wrapper);
    const level = wrapper.find('input[aria-label="Level"]');
    await level.setValue('four');
    expect(wrapper.text()).toMatch(/"four" is not a number/);
    await wrapper.setProps({ cell: { ...probe } });
    expect((wrapper.find('input[aria-label="Level"]').element as HTMLInputElement).value).toBe('four');
  });

  it('switching to a quantile drops the level and sets a probability', async () => {
    const sheet = reservoirSheet();
    const probe = cellOf(sheet, 'level-probe', 'probe');
    const wrapper = mount(ProbeCell, { props: editorProps(sheet, probe) });
    mounted.push(wrapper);
    await wrapper.find('select[aria-label="Quantity"]').setValue('quantile');
    const updated = (wrapper.emitted('update') as [unknown][]).at(-1)![0];
    expect(updated).toEqual({
      id: 'level-probe',
      kind: 'probe',
      simulation: 'level-run',
      quantity: 'quantile',
      state: 'L',
      probability: 0.5,
    });
  });
});

describe('ChartCell', () => {
  it('draws the chosen number of sample paths and says how many in its accessible name', async () => {
    const sheet = reservoirSheet();
    const chart = cellOf(sheet, 'level-chart', 'chart');
    const wrapper = mount(ChartCell, {
      props: editorProps(sheet, chart, { 'level-run': simulationOutput() }),
    });
    mounted.push(wrapper);
    await chartDrawn();
    const root = wrapper.find('[role="img"]');
    expect(root.attributes('aria-label')).toBe('Sample paths of L: 20 paths');
    expect(wrapper.text()).toContain('20 sample paths shown');
    expect(plotly.react).toHaveBeenCalled();
    const [, traces, layout] = plotly.react.mock.calls.at(-1)! as unknown as [
      HTMLElement,
      unknown[],
      { yaxis: { title: { text: string } } },
    ];
    expect(traces).toHaveLength(20);
    expect(layout.yaxis.title.text).toBe('L (m)');
  });

  it('offers PNG, SVG and CSV downloads', async () => {
    const sheet = reservoirSheet();
    const chart = cellOf(sheet, 'level-chart', 'chart');
    const wrapper = mount(ChartCell, {
      props: editorProps(sheet, chart, { 'level-run': simulationOutput() }),
    });
    mounted.push(wrapper);
    await flushPromises();
    const buttons = wrapper.findAll('button').map((b) => b.text());
    expect(buttons).toEqual(expect.arrayContaining(['PNG', 'SVG', 'CSV']));
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'SVG')!
      .trigger('click');
    expect(plotly.downloadImage).toHaveBeenCalledWith(
      expect.any(HTMLElement),
      expect.objectContaining({ format: 'svg' }),
    );
  });

  it('overlays the exact Ornstein–Uhlenbeck density on a histogram', async () => {
    const sheet = reservoirSheet();
    const chart = { ...cellOf(sheet, 'level-chart', 'chart'), view: 'histogram' as const };
    const wrapper = mount(ChartCell, {
      props: editorProps(sheet, chart, { 'level-run': simulationOutput() }),
    });
    mounted.push(wrapper);
    await flushPromises();
    expect(wrapper.find('[role="img"]').attributes('aria-label')).toBe(
      'Histogram of L at t = 30: 100 paths, with the exact Ornstein–Uhlenbeck density',
    );
  });

  it('says to run the simulation when it has no output yet', () => {
    const sheet = reservoirSheet();
    const wrapper = mount(ChartCell, { props: editorProps(sheet, cellOf(sheet, 'level-chart', 'chart')) });
    mounted.push(wrapper);
    expect(wrapper.text()).toContain('Run the simulation to see this chart.');
    expect(wrapper.find('[role="img"]').exists()).toBe(false);
  });
});

describe('SimulationCell output', () => {
  it('summarises the run: paths, steps, time, lost paths with the advice, digest and final statistics', () => {
    const sheet = reservoirSheet();
    const output = simulationOutput();
    if (output.kind !== 'simulation') throw new Error('fixture');
    output.result.losses = {
      ...output.result.losses,
      count: 3,
      share: 0.03,
      byCause: { domain: 0, infinite: 0, bound: 3 },
      firstTime: 12.5,
      conditional: true,
      message: '3 of 100 paths (3 %) were lost, the first at t = 12.50: 3 beyond the bound.',
      advice: ['Try a smaller step.'],
    };
    const wrapper = mount(SimulationCell, {
      props: editorProps(sheet, cellOf(sheet, 'level-run', 'simulation'), { 'level-run': output }),
    });
    mounted.push(wrapper);
    const summary = wrapper.find('[aria-label="Simulation summary"]');
    expect(summary.text()).toContain('3 of 100 paths (3 %) were lost, the first at t = 12.50');
    expect(summary.text()).toContain('Try a smaller step.');
    expect(summary.text()).toContain('0123456789abcdef');
    // Final mean of the fixture: 2.5 + 10 · 0.01.
    expect(summary.text()).toContain('2.6');
    expect(summary.text()).toContain('KernelJavaScript');
  });

  it('says which kernel ran, and why not the WebAssembly one when it fell back', () => {
    const sheet = reservoirSheet();
    const wasm = simulationOutput();
    if (wasm.kind !== 'simulation') throw new Error('fixture');
    wasm.result.kernel = 'wasm';
    const fast = mount(SimulationCell, {
      props: editorProps(sheet, cellOf(sheet, 'level-run', 'simulation'), { 'level-run': wasm }),
    });
    mounted.push(fast);
    expect(fast.find('[aria-label="Simulation summary"]').text()).toContain('KernelWebAssembly SIMD');
    const fallback = simulationOutput();
    if (fallback.kind !== 'simulation') throw new Error('fixture');
    fallback.result.kernelNote = 'this browser has no WebAssembly SIMD';
    const slow = mount(SimulationCell, {
      props: editorProps(sheet, cellOf(sheet, 'level-run', 'simulation'), { 'level-run': fallback }),
    });
    mounted.push(slow);
    expect(slow.find('[aria-label="Simulation summary"]').text()).toContain(
      'This run used the JavaScript kernel (same numbers, slower): this browser has no WebAssembly SIMD.',
    );
  });
});

describe('StudyCell', () => {
  it('shows the error chart and a table of levels with fitted orders and intervals', async () => {
    const sheet = reservoirSheet();
    const study = cellOf(sheet, 'level-study', 'study');
    const result: StudyResult = {
      levels: [8, 16, 32].map((steps) => ({
        steps,
        h: 30 / steps,
        strongError: 0.2 * Math.sqrt(30 / steps),
        strongSE: 0.004,
        weakError: 0.05 * (30 / steps),
        weakSE: 0.002,
      })),
      strongOrder: 0.503,
      strongOrderSE: 0.021,
      strongOrderCI: [0.462, 0.544],
      weakOrder: 0.98,
      weakOrderSE: 0.06,
      weakOrderCI: [0.862, 1.098],
      reference: 'finest',
      paths: 2000,
      excluded: 0,
    };
    const outputs: Record<string, CellOutput> = {
      'level-study': { kind: 'study', plan: fakeRun().plan, result, finishedAt, seconds: 3 },
    };
    const wrapper = mount(StudyCell, { props: editorProps(sheet, study, outputs) });
    mounted.push(wrapper);
    await chartDrawn();
    expect(wrapper.find('[role="img"]').attributes('aria-label')).toMatch(
      /strong and weak error against step size at 3 levels/,
    );
    const orders = wrapper.find('table[aria-label="Fitted orders"]').text();
    expect(orders).toMatch(/0\.503 ± 0\.021/);
    expect(orders).toMatch(/\[0\.462, 0\.544\]/);
    expect(wrapper.find('table[aria-label="Study levels"]').findAll('tbody tr')).toHaveLength(3);
    const [, traces] = plotly.react.mock.calls.at(-1)! as unknown as [HTMLElement, { name: string }[]];
    expect(traces.map((t) => t.name)).toEqual(['strong error', 'weak error', 'slope 1/2', 'slope 1']);
  });
});
