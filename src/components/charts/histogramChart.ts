import { axisTitle, chartLayout, CHART_COLOURS } from './chartTheme';
import { toCsv, fileNameFor } from './chartCsv';
import { nearestSavedIndex, plural, stateIndex, unitOf, type ChartBuild, type ChartInput } from './chartSpec';
import { histogram } from './histogram';
import { exactLawAt, lawDensity } from './exactLaw';
import { formatSignificant } from '../cells/numberFormat';
import { unitWithObserved, type ObservedOverlay } from './observedOverlay';

const DENSITY_POINTS = 200;

/** Observed values whose time is nearer to saved time k than to any other saved time. */
function observedNear(overlay: ObservedOverlay, savedTimes: ArrayLike<number>, k: number): number[] {
  const t = savedTimes[k]!;
  const before = k > 0 ? (t - savedTimes[k - 1]!) / 2 : 0;
  const after = k < savedTimes.length - 1 ? (savedTimes[k + 1]! - t) / 2 : 0;
  return overlay.values.filter((_, i) => {
    const time = overlay.times[i]!;
    return time >= t - before && time <= t + after;
  });
}

/**
 * The distribution of one state at one saved time, as a density histogram, with the exact
 * density drawn over it where the model has a known law (Ornstein–Uhlenbeck, geometric Brownian
 * motion; see exactLaw.ts).
 */
export function buildHistogramChart({ chart, result, plan, model, observed }: ChartInput): ChartBuild {
  const i = stateIndex(result, chart.state);
  if (i === null) return { ok: false, message: `The run has no state variable "${chart.state}".` };
  const k = nearestSavedIndex(result.savedTimes, chart.time ?? result.t1);
  const t = result.savedTimes[k]!;
  const all = result.savedValues[i]!;
  if (all.length === 0)
    return {
      ok: false,
      message:
        'A histogram needs every path’s values, which are not saved with a version: run the simulation to draw it.',
    };
  const values = all.subarray(k * result.paths, (k + 1) * result.paths);
  const bins = histogram(values, chart.bins);
  if (bins.n === 0)
    return {
      ok: false,
      message: `No path has a finite value of ${chart.state} at t = ${formatSignificant(t)}.`,
    };

  const centres = bins.counts.map((_, b) => (bins.edges[b]! + bins.edges[b + 1]!) / 2);
  const width = bins.edges[1]! - bins.edges[0]!;
  const traces: Record<string, unknown>[] = [
    {
      type: 'bar',
      x: centres,
      y: bins.density,
      width,
      name: 'simulated',
      marker: {
        color: CHART_COLOURS.accent,
        opacity: 0.55,
        line: { color: CHART_COLOURS.accent, width: 0.5 },
      },
      hovertemplate: `${chart.state} ≈ %{x:.4g}<br>density %{y:.4g}<extra></extra>`,
    },
  ];

  const law = model
    ? exactLawAt({
        model,
        params: plan.model.params,
        x0: plan.model.initial[i]!,
        t0: plan.t0,
        t,
        hasBoundary: (plan.boundaries[i]?.rule ?? 'none') !== 'none',
      })
    : null;
  const low = bins.edges[0]!;
  const high = bins.edges[bins.edges.length - 1]!;
  if (law) {
    const xs = Array.from(
      { length: DENSITY_POINTS },
      (_, n) => low + ((high - low) * n) / (DENSITY_POINTS - 1),
    );
    traces.push({
      type: 'scatter',
      mode: 'lines',
      x: xs,
      y: xs.map((x) => lawDensity(law, x)),
      name: `exact (${law.model})`,
      line: { color: CHART_COLOURS.contrast, width: 2 },
    });
  }

  const near = observed ? observedNear(observed, result.savedTimes, k) : [];
  if (observed && near.length > 0)
    traces.push({
      type: 'scatter',
      mode: 'markers',
      x: near,
      y: near.map(() => 0),
      name: `${observed.label} near t = ${formatSignificant(t)}`,
      marker: { color: CHART_COLOURS.contrast, symbol: 'line-ns-open', size: 16, line: { width: 2 } },
      hovertemplate: `${chart.state} observed = %{x:.4g}<extra></extra>`,
    });

  const title = chart.title ?? `Distribution of ${chart.state} at t = ${formatSignificant(t)}`;
  const rows: (number | string)[][] = centres.map((c, b) => [
    bins.edges[b]!,
    bins.edges[b + 1]!,
    bins.counts[b]!,
    bins.density[b]!,
    ...(law ? [lawDensity(law, c)] : []),
    ...(near.length > 0 ? [''] : []),
  ]);
  const header = ['bin_low', 'bin_high', 'count', 'density', ...(law ? ['exact_density_at_centre'] : [])];
  const unit = unitWithObserved(unitOf(plan, i), observed);
  for (const value of near) rows.push([...header.map(() => ''), value]);
  const excluded =
    bins.excluded > 0 ? ` ${plural(bins.excluded, 'path')} without a finite value left out.` : '';
  return {
    ok: true,
    spec: {
      traces,
      layout: chartLayout(
        { title: axisTitle(chart.state, unit) },
        { title: 'probability density' },
        { bargap: 0 },
      ),
      ariaLabel: `Histogram of ${chart.state} at t = ${formatSignificant(t)}: ${plural(bins.n, 'path')}${law ? `, with the exact ${law.model} density` : ''}`,
      caption: `${plural(bins.n, 'path')} in ${plural(bins.counts.length, 'bin')}${law ? `; line: exact density (${law.model})` : ''}${near.length > 0 ? `; ticks: ${plural(near.length, 'observed value')} near this time` : ''}`,
      csv: toCsv(
        [...header, ...(near.length > 0 ? [`observed_${chart.state}${unit ? ` [${unit}]` : ''}`] : [])],
        rows,
      ),
      fileName: fileNameFor(title),
      note:
        (law
          ? ''
          : 'No exact density: the model is not one with a known law (Ornstein–Uhlenbeck or geometric Brownian motion without boundaries).') +
          excluded || undefined,
    },
  };
}
