import { axisTitle, chartLayout, CHART_COLOURS } from './chartTheme';
import { toCsv, fileNameFor } from './chartCsv';
import { plural, stateIndex, unitOf, type ChartBuild, type ChartInput } from './chartSpec';
import { bandCoverage, type BandCoverage } from '@shared/data/calibration';
import { observedCsvHeader, observedCsvRows, observedMarkers, unitWithObserved } from './observedOverlay';

const percent = (share: number) => `${(100 * share).toFixed(1)} %`;

/** The calibration read-out in words, with its interval and the caution that goes with it. */
export function coverageWords(coverage: BandCoverage): string {
  if (coverage.share === null || coverage.interval === null)
    return 'No observed point lies within the simulated time range: no calibration read-out.';
  const left =
    coverage.outsideTimeRange > 0
      ? ` ${plural(coverage.outsideTimeRange, 'point')} outside the simulated times not counted.`
      : '';
  return (
    `Calibration: ${coverage.inside} of ${plural(coverage.counted, 'observed point')} (${percent(coverage.share)}) ` +
    `lie inside the simulated 5–95 % band; 95 % Clopper–Pearson interval ${percent(coverage.interval[0])} to ${percent(coverage.interval[1])}. ` +
    `A model that describes the data puts about 90 % inside. The interval treats the points as independent; ` +
    `points of one series seldom are, so read it as a rough guide.${left}`
  );
}

/** Quantile bands over time: 5–95 % and 25–75 %, the median and the mean. */
export function buildFanChart({ chart, result, plan, observed }: ChartInput): ChartBuild {
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
  const traces: Record<string, unknown>[] = [
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
  if (observed) traces.push(observedMarkers(observed, chart.state));
  const title = chart.title ?? `Quantile fan of ${chart.state}`;
  const rows: (number | string)[][] = t.map((time, k) => [
    time,
    stats.q05[k]!,
    stats.q25[k]!,
    stats.q50[k]!,
    stats.q75[k]!,
    stats.q95[k]!,
    stats.mean[k]!,
    stats.live[k]!,
    ...(observed ? ['', ''] : []),
  ]);
  const header = ['t', 'q05', 'q25', 'median', 'q75', 'q95', 'mean', 'live_paths'];
  if (observed) rows.push(...observedCsvRows(observed, header.length - 1));
  return {
    ok: true,
    spec: {
      traces,
      layout: chartLayout(
        { title: 'time t' },
        { title: axisTitle(chart.state, unitWithObserved(unitOf(plan, i), observed)) },
      ),
      ariaLabel: `Quantile fan of ${chart.state} over time: ${plural(result.paths, 'path')}${observed ? `, with ${plural(observed.times.length, 'observed point')}` : ''}`,
      caption: `5–95 % and 25–75 % bands, median and mean over ${plural(result.paths, 'path')}${observed ? `; diamonds: ${observed.label}` : ''}`,
      csv: toCsv([...header, ...(observed ? observedCsvHeader(observed, chart.state) : [])], rows),
      fileName: fileNameFor(title),
      readout: observed
        ? coverageWords(bandCoverage({ times: t, low: stats.q05, high: stats.q95 }, observed))
        : undefined,
    },
  };
}
