import { Z95 } from '@shared/engine/probes';
import type { SweepResult } from '@shared/run/sweep-result';
import { sweepTable } from '@shared/run/sweep-result';
import { chartLayout, CHART_COLOURS } from './chartTheme';
import { recordsCsv } from '@shared/run/csv';
import { fileNameFor } from './chartCsv';
import { plural, type ChartSpec } from './chartSpec';

/** The CSV of a sweep: its table, one row per point (the chart's data and the table's export). */
export function sweepCsv(result: SweepResult): string {
  return recordsCsv(sweepTable(result));
}

/**
 * One parameter: the estimate against the parameter with 95 % error bars (the probe's own
 * interval, asymmetric for proportions), the target as a line and the refined runs of the search.
 * Two parameters: a heat map of the estimate whose hover gives each point's interval.
 */
export function buildSweepChart(result: SweepResult): ChartSpec {
  return result.parameters.length === 1 ? curveChart(result) : heatMap(result);
}

function curveChart(result: SweepResult): ChartSpec {
  const parameter = result.parameters[0]!;
  const points = result.points.filter((point) => point.error === null);
  const x = points.map((point) => point.values[0]!);
  const traces: Record<string, unknown>[] = [
    {
      type: 'scatter',
      mode: 'lines+markers',
      name: result.probeTitle,
      x,
      y: points.map((point) => point.estimate),
      marker: { color: CHART_COLOURS.accent, size: 7 },
      line: { color: CHART_COLOURS.accent, width: 1.6 },
      error_y: {
        type: 'data',
        symmetric: false,
        array: points.map((point) => point.ci[1] - point.estimate),
        arrayminus: points.map((point) => point.estimate - point.ci[0]),
        visible: true,
        color: CHART_COLOURS.accent,
        thickness: 1,
      },
    },
  ];
  const target = result.target;
  if (target) {
    traces.push({
      type: 'scatter',
      mode: 'lines',
      name: `target ${target.target}`,
      x: [Math.min(...x), Math.max(...x)],
      y: [target.target, target.target],
      line: { color: CHART_COLOURS.reference, width: 1, dash: 'dash' },
      hoverinfo: 'skip',
    });
    if (target.refined.length > 0)
      traces.push({
        type: 'scatter',
        mode: 'markers',
        name: 'refined runs',
        x: target.refined.map((point) => point.x),
        y: target.refined.map((point) => point.estimate),
        marker: { color: CHART_COLOURS.contrast, symbol: 'diamond', size: 8 },
        error_y: {
          type: 'data',
          symmetric: false,
          array: target.refined.map((point) => point.ci[1] - point.estimate),
          arrayminus: target.refined.map((point) => point.estimate - point.ci[0]),
          visible: true,
          color: CHART_COLOURS.contrast,
          thickness: 1,
        },
      });
  }
  const logAxis = x.length > 2 && x.every((value) => value > 0) && isGeometric(x);
  return {
    traces,
    layout: chartLayout({ title: parameter, type: logAxis ? 'log' : 'linear' }, { title: result.probeTitle }),
    ariaLabel: `Sweep of ${parameter}: ${result.probeTitle} at ${plural(points.length, 'value')}, ${plural(result.pathsPerPoint, 'path')} each, with 95 % intervals`,
    caption: `Error bars: 95 % intervals; ${plural(result.pathsPerPoint, 'path')} per value, ${result.commonRandomNumbers ? 'common random numbers' : 'independent runs'}`,
    csv: sweepCsv(result),
    fileName: fileNameFor(`sweep ${parameter} ${result.probeTitle}`),
  };
}

function isGeometric(values: number[]): boolean {
  const ratio = values[1]! / values[0]!;
  return (
    Math.abs(ratio - 1) > 1e-9 &&
    values.every((v, k) => k === 0 || Math.abs(v / values[k - 1]! / ratio - 1) < 1e-6)
  );
}

function heatMap(result: SweepResult): ChartSpec {
  const [first, second] = result.parameters as [string, string];
  const [xs, ys] = result.axisValues as [number[], number[]];
  // Points run over the first axis slowest: z[row = second axis][column = first axis].
  const at = (i: number, j: number) => result.points[i * ys.length + j];
  const z = ys.map((_, j) => xs.map((__, i) => at(i, j)?.estimate ?? null));
  const text = ys.map((_, j) =>
    xs.map((__, i) => {
      const point = at(i, j);
      if (!point || point.error !== null) return point?.error ?? '';
      return `${result.probeTitle}: ${point.estimate.toPrecision(4)} ± ${point.standardError.toPrecision(2)}<br>95 % interval [${point.ci[0].toPrecision(4)}, ${point.ci[1].toPrecision(4)}]`;
    }),
  );
  return {
    traces: [
      {
        type: 'heatmap',
        x: xs,
        y: ys,
        z,
        text,
        hovertemplate: `${first} = %{x}<br>${second} = %{y}<br>%{text}<extra></extra>`,
        colorscale: [
          [0, CHART_COLOURS.paper],
          [1, CHART_COLOURS.accent],
        ],
        colorbar: { title: { text: result.probeTitle, side: 'right' } },
      },
    ],
    layout: chartLayout({ title: first }, { title: second }),
    ariaLabel: `Sweep of ${first} and ${second}: ${result.probeTitle} on a ${xs.length} by ${ys.length} grid, ${plural(result.pathsPerPoint, 'path')} per point`,
    caption: `Colour: the estimate; hover a cell for its 95 % interval (± ${Z95.toFixed(2)} standard errors for means, Wilson for proportions)`,
    csv: sweepCsv(result),
    fileName: fileNameFor(`sweep ${first} ${second} ${result.probeTitle}`),
  };
}
