import { axisTitle, chartLayout, PATH_COLOURS } from './chartTheme';
import { toCsv, fileNameFor } from './chartCsv';
import { plural, stateIndex, unitOf, type ChartBuild, type ChartInput } from './chartSpec';
import { observedCsvHeader, observedCsvRows, observedMarkers, unitWithObserved } from './observedOverlay';

export const DEFAULT_PATH_COUNT = 20;
const WEBGL_POINT_THRESHOLD = 200_000;

/** A few whole paths of one state against time. */
export function buildPathsChart({ chart, result, plan, observed }: ChartInput): ChartBuild {
  const i = stateIndex(result, chart.state);
  if (i === null) return { ok: false, message: `The run has no state variable "${chart.state}".` };
  const available = result.samplePaths[i] ?? [];
  if (available.length === 0)
    return {
      ok: false,
      message: 'The run kept no sample paths: raise "Sample paths kept" in the simulation.',
    };
  const count = Math.min(chart.pathCount ?? DEFAULT_PATH_COUNT, available.length);
  const times = Array.from(result.savedTimes);
  const paths = available.slice(0, count);
  // SVG lines draw everywhere (also without a GPU) and export as real SVG; only very large
  // charts fall back to WebGL.
  const traceType = count * times.length > WEBGL_POINT_THRESHOLD ? 'scattergl' : 'scatter';
  const traces: Record<string, unknown>[] = paths.map((path, p) => ({
    type: traceType,
    mode: 'lines',
    x: times,
    y: Array.from(path),
    name: `path ${p + 1}`,
    showlegend: false,
    line: { width: 1.1, color: PATH_COLOURS[p % PATH_COLOURS.length] },
    opacity: 0.85,
    hovertemplate: `path ${p + 1}<br>t = %{x:.4g}<br>${chart.state} = %{y:.4g}<extra></extra>`,
  }));
  if (observed) traces.push(observedMarkers(observed, chart.state));
  const title = chart.title ?? `Sample paths of ${chart.state}`;
  const rows: (number | string)[][] = times.map((t, k) => [
    t,
    ...paths.map((path) => path[k]!),
    ...(observed ? ['', ''] : []),
  ]);
  const header = ['t', ...paths.map((_, p) => `${chart.state}_path${p + 1}`)];
  if (observed) rows.push(...observedCsvRows(observed, header.length - 1));
  return {
    ok: true,
    spec: {
      traces,
      layout: chartLayout(
        { title: 'time t' },
        { title: axisTitle(chart.state, unitWithObserved(unitOf(plan, i), observed)) },
      ),
      ariaLabel: `Sample paths of ${chart.state}: ${plural(count, 'path')}${observed ? `, with ${plural(observed.times.length, 'observed point')}` : ''}`,
      caption: `${plural(count, 'sample path')} shown${observed ? `; diamonds: ${observed.label}` : ''}`,
      csv: toCsv([...header, ...(observed ? observedCsvHeader(observed, chart.state) : [])], rows),
      fileName: fileNameFor(title),
      note:
        count < (chart.pathCount ?? DEFAULT_PATH_COUNT)
          ? `The run kept only ${plural(available.length, 'sample path')}.`
          : undefined,
    },
  };
}
