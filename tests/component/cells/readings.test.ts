import { afterEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import NoteReading from '@/components/cells/NoteReading.vue';
import ParamsReading from '@/components/cells/ParamsReading.vue';
import ModelReading from '@/components/cells/ModelReading.vue';
import SimulationReading from '@/components/cells/SimulationReading.vue';
import ChartReading from '@/components/cells/ChartReading.vue';
import ProbeReading from '@/components/cells/ProbeReading.vue';
import StudyReading from '@/components/cells/StudyReading.vue';
import type { CellOutput } from '@/components/cells/contract';
import type { Cell, SheetDocument } from '@shared/sheet/document';
import { cellOf, fakeRun, reservoirSheet } from './fixtures';

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
  vi.clearAllMocks();
});

function readingProps<C extends Cell>(
  document: SheetDocument,
  cell: C,
  outputs: Record<string, CellOutput | undefined> = {},
) {
  return { cell, document, issues: [], outputs, stale: false };
}

/** Until KaTeX (loaded lazily) has typeset what the component shows. */
async function typeset(wrapper: VueWrapper): Promise<void> {
  for (let turn = 0; turn < 100 && !wrapper.find('.katex').exists(); turn += 1) {
    await flushPromises();
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

const finishedAt = new Date('2026-03-01T10:00:00Z');

describe('ModelReading', () => {
  it('typesets each state as dX = … dt + … dW with KaTeX, with its unit and start', async () => {
    const sheet = reservoirSheet();
    const wrapper = mount(ModelReading, {
      props: readingProps(sheet, cellOf(sheet, 'level-model', 'model')),
    });
    mounted.push(wrapper);
    await typeset(wrapper);
    const equations = wrapper.get('[aria-label="Equations of the model"]');
    // KaTeX writes the TeX it typeset into the MathML annotation, for screen readers and copying.
    const annotations = equations.findAll('annotation').map((a) => a.text());
    expect(annotations).toContain(String.raw`dL = \kappa\,\left(\mathrm{target} - L\right)\,dt + \sigma\,dR`);
    expect(annotations).toContain(String.raw`L(t_0) = L_{0}`);
    expect(equations.findAll('.katex-display')).toHaveLength(1);
    expect(wrapper.text()).toContain('L in m');
    expect(wrapper.text()).toContain('Itô form');
  });

  it('shows a coefficient that does not check as code, with its problem, never typeset', async () => {
    const sheet = reservoirSheet();
    const model = cellOf(sheet, 'level-model', 'model');
    const broken = { ...model, states: [{ ...model.states[0]!, drift: 'kappa * (target - L' }] };
    const wrapper = mount(ModelReading, { props: readingProps(sheet, broken) });
    mounted.push(wrapper);
    await typeset(wrapper);
    expect(wrapper.find('.katex-display').exists()).toBe(false);
    expect(wrapper.find('code').text()).toContain('kappa * (target - L');
    expect(wrapper.text()).toMatch(/not typeset: drift: /);
  });
});

describe('ParamsReading', () => {
  it('shows a table of symbol, value and unit', async () => {
    const sheet = reservoirSheet();
    const wrapper = mount(ParamsReading, { props: readingProps(sheet, cellOf(sheet, 'pars', 'params')) });
    mounted.push(wrapper);
    await typeset(wrapper);
    const headers = wrapper.findAll('thead th').map((th) => th.text());
    expect(headers).toEqual(['Symbol', 'Value', 'Unit', 'About']);
    const rows = wrapper.findAll('tbody tr');
    expect(rows).toHaveLength(4);
    const first = rows[0]!;
    expect(first.get('th').attributes('aria-label')).toBe('kappa');
    expect(first.find('annotation').text()).toBe(String.raw`\kappa`);
    expect(first.findAll('td').map((td) => td.text())).toEqual([
      '0.8',
      '1/day',
      'Pull towards the target level',
    ]);
  });
});

describe('SimulationReading', () => {
  it('sums a simulation up in one line: model, method, step, span, paths, seed, digest and kernel', () => {
    const sheet = reservoirSheet();
    const { plan, result } = fakeRun();
    const wrapper = mount(SimulationReading, {
      props: readingProps(sheet, cellOf(sheet, 'level-run', 'simulation'), {
        'level-run': { kind: 'simulation', plan, result, engineVersion: 1, finishedAt, seconds: 1 },
      }),
    });
    mounted.push(wrapper);
    const line = wrapper.get('.summary-line').text().replace(/\s+/g, ' ');
    expect(line).toBe(
      `Reservoir level · Euler–Maruyama · h = 0.01 (3,000 steps) · t from 0 to 30 · 20,000 paths · seed 8812 · digest ${result.digest} · JavaScript kernel`,
    );
  });

  it('says when it has not run yet', () => {
    const sheet = reservoirSheet();
    const wrapper = mount(SimulationReading, {
      props: readingProps(sheet, cellOf(sheet, 'level-run', 'simulation')),
    });
    mounted.push(wrapper);
    expect(wrapper.text()).toMatch(/seed 8812 · not run yet$/);
  });
});

describe('results as reading views', () => {
  it('shows a probe as its estimate with its error', () => {
    const sheet = reservoirSheet();
    const wrapper = mount(ProbeReading, {
      props: readingProps(sheet, cellOf(sheet, 'level-probe', 'probe'), {
        'level-probe': {
          kind: 'probe',
          estimate: { estimate: 0.08215, standardError: 0.001941, ci: [0.07846, 0.08604], paths: 20000 },
          finishedAt,
        },
      }),
    });
    mounted.push(wrapper);
    expect(wrapper.get('[aria-label="Probe result"]').text()).toMatch(/0\.0822\s*±\s*0\.0019/);
    expect(wrapper.find('input').exists()).toBe(false);
  });

  it('shows a chart as the chart, with its toolbar and no settings', async () => {
    const sheet = reservoirSheet();
    const { plan, result } = fakeRun();
    const wrapper = mount(ChartReading, {
      props: readingProps(sheet, cellOf(sheet, 'level-chart', 'chart'), {
        'level-run': { kind: 'simulation', plan, result, engineVersion: 1, finishedAt, seconds: 1 },
      }),
    });
    mounted.push(wrapper);
    await flushPromises();
    expect(wrapper.find('[role="img"]').exists()).toBe(true);
    expect(wrapper.find('[role="toolbar"]').exists()).toBe(true);
    expect(wrapper.find('select, input, [role="combobox"]').exists()).toBe(false);
  });

  it('says what a study will do before it has run', () => {
    const sheet = reservoirSheet();
    const wrapper = mount(StudyReading, {
      props: readingProps(sheet, cellOf(sheet, 'level-study', 'study')),
    });
    mounted.push(wrapper);
    expect(wrapper.text()).toContain('5 levels from 8 steps, 2,000 paths');
  });

  it('renders a note as its formatted text', () => {
    const sheet = reservoirSheet();
    const wrapper = mount(NoteReading, { props: readingProps(sheet, cellOf(sheet, 'intro', 'note')) });
    mounted.push(wrapper);
    expect(wrapper.find('h1').text()).toBe('Reservoir');
    expect(wrapper.find('em').text()).toBe('mean-reverting');
  });
});
