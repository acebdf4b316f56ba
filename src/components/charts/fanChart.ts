import { axisTitle, chartLayout, CHART_COLOURS } from './chartTheme';
import { toCsv, fileNameFor } from './chartCsv';
import { plural, stateIndex, unitOf, type ChartBuild, type ChartInput } from './chartSpec';

/** Quantile bands over time: 5–95 % and 25–75 %, the median and the mean. */
export function buildFanChart({ chart, result, plan }: ChartInput): ChartBuild {
  const i = stateIndex(result, chart.state);
  if (i === null) return { ok: false, message: `The run has no state variable "${chart.state}".` };
  const stats = result.stats[i]!;
  const t = Array.from(result.savedTimes);
  const band = (low: Float64Array, high: Float64Array, name: string, fill: string) => [
    {
      type: 'scatter',
      mode: 'lines',
      x: t,
      y: Array.from(low),
      line: { width: 0 },
      hoverinfo: 'skip',
      showlegend: false,
    },
    {
      type: 'scatter',
      mode: 'lines',
      x: t,
      y: Array.from(high),
      line: { width: 0 },
      fill: 'tonexty',
      fillcolor: fill,
      name,
      hoverinfo: 'skip',
    },
  ];
  const traces = [
    ...band(stats.q05, stats.q95, '5–95 %', 'rgba(29, 106, 100, 0.16)'),
    ...band(stats.q25, stats.q75, '25–75 %', 'rgba(29, 106, 100, 0.32)'),
    {
      type: 'scatter',
      mode: 'lines',
      x: t,
      y: Array.from(stats.q50),
      name: 'median',
      line: { color: CHART_COLOURS.accent, width: 2 },
    },
    {
      type: 'scatter',
      mode: 'lines',
      x: t,
      y: Array.from(stats.mean),
      name: 'mean',
      line: { color: CHART_COLOURS.contrast, width: 1.6, dash: 'dash' },
    },
  ];
  const title = chart.title ?? `Quantile fan of ${chart.state}`;
  const rows = t.map((time, k) => [
    time,
    stats.q05[k]!,
    stats.q25[k]!,
    stats.q50[k]!,
    stats.q75[k]!,
    stats.q95[k]!,
    stats.mean[k]!,
    stats.live[k]!,
  ]);
  return {
    ok: true,
    spec: {
      traces,
      layout: chartLayout({ title: 'time t' }, { title: axisTitle(chart.state, unitOf(plan, i)) }),
      ariaLabel: `Quantile fan of ${chart.state} over time: ${plural(result.paths, 'path')}`,
      caption: `5–95 % and 25–75 % bands, median and mean over ${plural(result.paths, 'path')}`,
      csv: toCsv(['t', 'q05', 'q25', 'median', 'q75', 'q95', 'mean', 'live_paths'], rows),
      fileName: fileNameFor(title),
    },
  };
}
