import { axisTitle, chartLayout, PATH_COLOURS } from './chartTheme';
import { toCsv, fileNameFor } from './chartCsv';
import { plural, stateIndex, unitOf, type ChartBuild, type ChartInput } from './chartSpec';
import { DEFAULT_PATH_COUNT } from './pathsChart';

/** Sample paths in the plane of two state variables. */
export function buildPhaseChart({ chart, result, plan }: ChartInput): ChartBuild {
  const stateY = chart.stateY;
  if (!stateY) return { ok: false, message: 'A phase plot needs a second state variable.' };
  const i = stateIndex(result, chart.state);
  const j = stateIndex(result, stateY);
  if (i === null || j === null)
    return { ok: false, message: `The run has no state variable "${i === null ? chart.state : stateY}".` };
  const xs = result.samplePaths[i] ?? [];
  const ys = result.samplePaths[j] ?? [];
  const available = Math.min(xs.length, ys.length);
  if (available === 0)
    return {
      ok: false,
      message: 'The run kept no sample paths: raise "Sample paths kept" in the simulation.',
    };
  const count = Math.min(chart.pathCount ?? DEFAULT_PATH_COUNT, available);
  const traces = Array.from({ length: count }, (_, p) => ({
    type: 'scatter',
    mode: 'lines',
    x: Array.from(xs[p]!),
    y: Array.from(ys[p]!),
    name: `path ${p + 1}`,
    showlegend: false,
    line: { width: 1.1, color: PATH_COLOURS[p % PATH_COLOURS.length] },
    opacity: 0.85,
  }));
  const title = chart.title ?? `${stateY} against ${chart.state}`;
  const rows: (number | string)[][] = [];
  for (let p = 0; p < count; p += 1) {
    result.savedTimes.forEach((t, k) => rows.push([p + 1, t, xs[p]![k]!, ys[p]![k]!]));
  }
  return {
    ok: true,
    spec: {
      traces,
      layout: chartLayout(
        { title: axisTitle(chart.state, unitOf(plan, i)) },
        { title: axisTitle(stateY, unitOf(plan, j)) },
      ),
      ariaLabel: `Phase plot of ${stateY} against ${chart.state}: ${plural(count, 'path')}`,
      caption: `${plural(count, 'sample path')} shown`,
      csv: toCsv(['path', 't', chart.state, stateY], rows),
      fileName: fileNameFor(title),
    },
  };
}
