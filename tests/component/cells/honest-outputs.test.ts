import { afterEach, describe, expect, it, vi } from 'vitest';
import { mount, type VueWrapper } from '@vue/test-utils';
import ProbeCell from '@/components/cells/ProbeCell.vue';
import ChartCell from '@/components/cells/ChartCell.vue';
import SimulationCell from '@/components/cells/SimulationCell.vue';
import type { CellOutput } from '@/components/cells/contract';
import { estimateRunCost } from '@/components/cells/simulationCost';
import type { LossSummary, StabilityReport } from '@shared/engine';
import { stepCount } from '@shared/sheet/step-count';
import { estimateWork } from '@shared/engine/work';
import type {
  ProbeCell as ProbeCellType,
  SimulationCell as SimulationCellType,
} from '@shared/sheet/document';
import { cellOf, editorProps, fakeRun, reservoirSheet } from './fixtures';

vi.mock('plotly.js-dist-min', () => ({
  default: {
    react: vi.fn(async (element: HTMLElement) => element),
    purge: vi.fn(),
    Plots: { resize: vi.fn() },
  },
}));

const mounted: VueWrapper[] = [];
afterEach(() => {
  while (mounted.length) mounted.pop()!.unmount();
});

const finishedAt = new Date('2026-03-01T10:00:00Z');

/** 300 of 1,000 paths lost to a square root of a negative state: a conditional run. */
const CONDITIONAL_LOSSES: LossSummary = {
  count: 300,
  paths: 1000,
  share: 0.3,
  byCause: { domain: 300, infinite: 0, bound: 0 },
  firstTime: 1.25,
  conditional: true,
  allLost: false,
  message: '300 of 1,000 paths (30 %) were lost, the first at t = 1.250: 300 not a number.',
  advice: ['use a boundary rule on L, or sqrt(max(L, 0))'],
};

const UNSTABLE_STEP: StabilityReport = {
  check: 'linear-drift',
  scheme: 'euler-maruyama',
  lambda: -40,
  lambdaImag: 0,
  mu: null,
  h: 0.1,
  time: 0,
  stable: false,
  modelStable: true,
  amplification: 3,
  maxStableStep: 0.05,
  message: 'The step 0.1 is unstable for this drift: use a step below 0.05.',
};

function simulationOutput(change: (output: Extract<CellOutput, { kind: 'simulation' }>) => void = () => {}) {
  const { plan, result } = fakeRun();
  const output: Extract<CellOutput, { kind: 'simulation' }> = {
    kind: 'simulation',
    plan,
    result,
    engineVersion: 1,
    finishedAt,
    seconds: 1.25,
  };
  change(output);
  return output;
}

function mountSimulation(output: CellOutput, cell?: SimulationCellType) {
  const sheet = reservoirSheet();
  const wrapper = mount(SimulationCell, {
    props: editorProps(sheet, cell ?? cellOf(sheet, 'level-run', 'simulation'), { 'level-run': output }),
  });
  mounted.push(wrapper);
  return wrapper;
}

describe('the simulation cell says what the engine could not stand behind', () => {
  it('lists lost paths by cause with the advice and says the estimates are conditional', () => {
    const wrapper = mountSimulation(simulationOutput((o) => (o.result.losses = CONDITIONAL_LOSSES)));
    const summary = wrapper.find('[aria-label="Simulation summary"]').text();
    expect(summary).toContain(CONDITIONAL_LOSSES.message!);
    expect(summary).toContain('use a boundary rule on L, or sqrt(max(L, 0))');
    expect(summary).toMatch(/estimates are conditional on the 700 surviving paths/);
  });

  it('shows no estimates when every path was lost', () => {
    const wrapper = mountSimulation(
      simulationOutput((o) => {
        o.result.losses = { ...CONDITIONAL_LOSSES, count: 1000, share: 1, allLost: true };
      }),
    );
    const summary = wrapper.find('[aria-label="Simulation summary"]');
    expect(summary.text()).toContain('No estimates: every path was lost.');
    expect(summary.find('table.final-stats').exists()).toBe(false);
  });

  it('warns of an unstable step before the numbers', () => {
    const wrapper = mountSimulation(simulationOutput((o) => (o.result.stability = UNSTABLE_STEP)));
    const html = wrapper.find('[aria-label="Simulation summary"]').html();
    expect(html).toContain(UNSTABLE_STEP.message);
    expect(html.indexOf(UNSTABLE_STEP.message)).toBeLessThan(html.indexOf('final-stats'));
  });

  it('shows no stability box when the step is stable and nothing was lost', () => {
    const wrapper = mountSimulation(
      simulationOutput((o) => {
        o.result.stability = { ...UNSTABLE_STEP, stable: true, message: 'The step is stable.' };
      }),
    );
    expect(wrapper.text()).not.toContain('The step is stable.');
    expect(wrapper.find('[aria-label="Simulation warnings"]').exists()).toBe(false);
  });

  it('counts paths at the end as running, absorbed and lost, adding up to all paths', () => {
    const wrapper = mountSimulation(
      simulationOutput((o) => {
        o.result.paths = 100;
        // 100 paths, 6 lost: 94 with a value at t1, of which 10 were absorbed.
        o.result.stats[0]!.live.fill(94);
        o.result.extinctions = [{ state: 0, count: 10, firstTime: 2, meanTime: 5 }];
        o.result.losses = { ...CONDITIONAL_LOSSES, count: 6, paths: 100, share: 0.06 };
      }),
    );
    const cells = wrapper.findAll('table.final-stats tbody td').map((cell) => cell.text());
    expect(cells.slice(-3)).toEqual(['84', '10', '6']);
    const head = wrapper.find('table.final-stats thead').text();
    expect(head).toContain('Running');
    expect(head).toContain('Absorbed');
    expect(head).toContain('Lost');
    expect(head).not.toContain('Live paths');
  });

  it('shows the covariance matrix at t1 for a model with two states', () => {
    const wrapper = mountSimulation(
      simulationOutput((o) => {
        o.result.stateNames = ['P', 'Q'];
        o.result.stats = [o.result.stats[0]!, o.result.stats[0]!];
        const last = o.result.savedTimes.length - 1;
        const covariance = new Float64Array(o.result.savedTimes.length * 4);
        covariance.set([0.25, -0.125, -0.125, 0.5], last * 4);
        o.result.covariance = covariance;
      }),
    );
    const table = wrapper.find('table[aria-label="Covariance matrix at the end time"]');
    expect(table.exists()).toBe(true);
    expect(table.text()).toMatch(/[-−]0\.125/);
    expect(table.text()).toContain('0.5');
  });
});

describe('probe outputs carry their warnings and monitoring', () => {
  it('shows the warnings before the number and how the level was watched', () => {
    const sheet = reservoirSheet();
    const probe = cellOf(sheet, 'level-probe', 'probe');
    const warning = 'conditional on the 700 surviving paths: 300 of 1,000 were lost';
    const outputs: Record<string, CellOutput> = {
      'level-probe': {
        kind: 'probe',
        estimate: {
          estimate: 0.2,
          standardError: 0.01,
          ci: [0.18, 0.22],
          paths: 700,
          warnings: [warning],
          monitoring: 'discrete monitoring: the level is checked at the 3,000 steps only',
        },
        finishedAt,
      },
    };
    const wrapper = mount(ProbeCell, { props: editorProps(sheet, probe, outputs) });
    mounted.push(wrapper);
    const html = wrapper.html();
    expect(wrapper.find('[role="alert"]').text()).toContain(warning);
    expect(html.indexOf(warning)).toBeLessThan(html.indexOf('Probe result'));
    expect(wrapper.text()).toContain('discrete monitoring: the level is checked at the 3,000 steps only');
  });

  it('offers the continuity correction on a hit-before probe and stores it', async () => {
    const sheet = reservoirSheet();
    const probe: ProbeCellType = { ...cellOf(sheet, 'level-probe', 'probe'), quantity: 'hit-before' };
    const wrapper = mount(ProbeCell, { props: editorProps(sheet, probe) });
    mounted.push(wrapper);
    const group = wrapper.find('[role="radiogroup"][aria-label="Monitoring"]');
    expect(group.exists()).toBe(true);
    const radios = group.findAll('input[type="radio"]');
    await radios.at(1)!.setValue(true);
    const updated = (wrapper.emitted('update') as [ProbeCellType][]).at(-1)![0];
    expect(updated.monitoring).toBe('bgk');
  });

  it('offers covariance with a second state picker', async () => {
    const sheet = reservoirSheet();
    const probe = cellOf(sheet, 'level-probe', 'probe');
    const wrapper = mount(ProbeCell, { props: editorProps(sheet, probe) });
    mounted.push(wrapper);
    await wrapper.find('select[aria-label="Quantity"]').setValue('covariance');
    const updated = (wrapper.emitted('update') as [ProbeCellType][]).at(-1)![0];
    expect(updated.quantity).toBe('covariance');
    expect(updated.level).toBeUndefined();
    await wrapper.setProps({ cell: updated });
    expect(wrapper.find('select[aria-label="Second state"]').exists()).toBe(true);
  });
});

describe('charts of a conditional run', () => {
  it('say the chart shows only the surviving paths', () => {
    const sheet = reservoirSheet();
    const chart = cellOf(sheet, 'level-chart', 'chart');
    const outputs = { 'level-run': simulationOutput((o) => (o.result.losses = CONDITIONAL_LOSSES)) };
    const wrapper = mount(ChartCell, { props: editorProps(sheet, chart, outputs) });
    mounted.push(wrapper);
    expect(wrapper.text()).toMatch(/conditional on the 700 surviving paths/);
  });
});

describe('the run cost', () => {
  it('counts steps as the engine does (one home: shared step count)', () => {
    const sheet = reservoirSheet();
    const cell: SimulationCellType = {
      ...cellOf(sheet, 'level-run', 'simulation'),
      steps: undefined,
      stepSize: 0.65,
    };
    const cost = estimateRunCost(cell, 1, 4);
    // 30 / 0.65 = 46.15…: the engine rounds to 46 steps.
    expect(cost?.steps).toBe(stepCount(cell));
    expect(cost?.steps).toBe(46);
  });

  it('takes the work estimate from the engine (one throughput constant)', () => {
    const sheet = reservoirSheet();
    const cell: SimulationCellType = {
      ...cellOf(sheet, 'level-run', 'simulation'),
      paths: 10_000_000,
      steps: 10_000_000,
    };
    const cost = estimateRunCost(cell, 2, 4);
    const shared = estimateWork({ paths: cell.paths, steps: 10_000_000, model: { stateNames: ['P', 'Q'] } });
    expect(cost?.work).toEqual(shared);
    expect(cost?.work.beyondMinutes).toBe(true);
  });
});
