import type { ScenariosResult } from '@shared/run/scenarios-result';
import { axisTitle, chartLayout, PATH_COLOURS } from './chartTheme';
import { fileNameFor, toCsv } from './chartCsv';
import { plural, type ChartSpec } from './chartSpec';

/** Line styles by scenario, so scenarios stay apart without colour too. */
const DASHES = ['solid', 'dash', 'dot', 'dashdot', 'longdash', 'longdashdot'];
const SYMBOLS = ['circle', 'square', 'diamond', 'triangle-up', 'cross', 'x'];

const colourOf = (k: number) => PATH_COLOURS[k % PATH_COLOURS.length]!;
const dashOf = (k: number) => DASHES[k % DASHES.length]!;

/** 5–95 % band as a translucent fill of the scenario's colour. */
function translucent(hex: string): string {
  const n = Number.parseInt(hex.slice(1), 16);
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, 0.14)`;
}

/** The scenarios' fans of one state overlaid: median and 5–95 % band each, by colour and line style. */
export function buildScenarioFan(result: ScenariosResult, state: string): ChartSpec | null {
  const fans = result.scenarios.map((scenario) => scenario.fan.find((fan) => fan.state === state));
  if (fans.some((fan) => fan === undefined)) return null;
  const traces: Record<string, unknown>[] = [];
  const rows: (number | string)[][] = [];
  result.scenarios.forEach((scenario, k) => {
    const fan = fans[k]!;
    const colour = colourOf(k);
    const group = `scenario-${k}`;
    traces.push(
      {
        type: 'scatter',
        mode: 'lines',
        x: fan.times,
        y: fan.q95,
        line: { width: 0, color: colour },
        legendgroup: group,
        showlegend: false,
        hoverinfo: 'skip',
      },
      {
        type: 'scatter',
        mode: 'lines',
        x: fan.times,
        y: fan.q05,
        fill: 'tonexty',
        fillcolor: translucent(colour),
        line: { width: 0, color: colour },
        legendgroup: group,
        showlegend: false,
        hoverinfo: 'skip',
      },
      {
        type: 'scatter',
        mode: 'lines',
        name: `${scenario.name}${scenario.name === result.baseline ? ' (baseline)' : ''}: median, 5–95 %`,
        x: fan.times,
        y: fan.q50,
        line: { color: colour, width: 2, dash: dashOf(k) },
        legendgroup: group,
      },
    );
    fan.times.forEach((time, i) => rows.push([scenario.name, time, fan.q05[i]!, fan.q50[i]!, fan.q95[i]!]));
  });
  const unit = fans[0]!.unit;
  return {
    traces,
    layout: chartLayout({ title: 'time t' }, { title: axisTitle(state, unit) }),
    ariaLabel: `Fans of ${state} for ${plural(result.scenarios.length, 'scenario')}: median and 5–95 % band over time, ${plural(result.paths, 'path')} each`,
    caption: `Median (line) and 5–95 % band (shaded) of ${state} per scenario; each scenario has its own colour and line style`,
    csv: toCsv(['scenario', 't', `${state}_q05`, `${state}_q50`, `${state}_q95`], rows),
    fileName: fileNameFor(`scenarios fan ${state}`),
  };
}

/**
 * One probe across the scenarios: a dot per scenario with its 95 % interval, one row each (one
 * chart per probe, so probes on different scales do not share an axis).
 */
export function buildScenarioProbe(result: ScenariosResult, probeIndex: number): ChartSpec | null {
  const probe = result.probes[probeIndex];
  if (!probe) return null;
  const traces = result.scenarios.map((scenario, k) => {
    const at = scenario.probes[probeIndex]!;
    return {
      type: 'scatter',
      mode: 'markers',
      name: scenario.name,
      x: [at.estimate],
      y: [scenario.name],
      marker: { color: colourOf(k), symbol: SYMBOLS[k % SYMBOLS.length], size: 10 },
      error_x: {
        type: 'data',
        symmetric: false,
        array: [at.ci[1] - at.estimate],
        arrayminus: [at.estimate - at.ci[0]],
        visible: true,
        color: colourOf(k),
        thickness: 1.4,
      },
    };
  });
  const layout = chartLayout(
    { title: `${probe.title}, with 95 % interval` },
    { title: '' },
    { margin: { l: 140, r: 16, t: 16, b: 52 }, showlegend: false },
  );
  // Scenarios are categories, one row each, in the cell's order from the top.
  layout.yaxis = { ...(layout.yaxis as object), type: 'category', autorange: 'reversed' };
  const rows = result.scenarios.map((scenario) => {
    const at = scenario.probes[probeIndex]!;
    return [scenario.name, at.estimate, at.standardError, at.ci[0], at.ci[1]];
  });
  return {
    traces,
    layout,
    ariaLabel: `${probe.title} for ${plural(result.scenarios.length, 'scenario')}, each with its 95 % interval`,
    caption: `${probe.title}: dots are estimates, bars 95 % intervals; one marker shape and colour per scenario`,
    csv: toCsv(['scenario', 'estimate', 'standardError', 'ciLow', 'ciHigh'], rows),
    fileName: fileNameFor(`scenarios ${probe.title}`),
  };
}
