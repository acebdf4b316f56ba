import type { StudyResult } from '@shared/engine';
import { chartLayout, CHART_COLOURS } from './chartTheme';
import { toCsv, fileNameFor } from './chartCsv';
import { plural, type ChartSpec } from './chartSpec';

/**
 * Strong and weak error against the step size on log–log axes, with reference lines of slope 1/2
 * and 1 (the strong order of Euler–Maruyama, and its weak order and Milstein's strong order;
 * Kloeden & Platen 1992, chapters 10 and 14; Higham 2001). A reference line passes through the
 * error at the coarsest step, so a scheme running parallel to it has that order.
 */
export function buildStudyChart(result: StudyResult, stateName: string): ChartSpec | null {
  const levels = result.levels.filter((l) => l.h > 0);
  if (levels.length === 0) return null;
  const h = levels.map((l) => l.h);
  const traces: Record<string, unknown>[] = [];
  const series = [
    {
      name: 'strong error',
      values: levels.map((l) => l.strongError),
      se: levels.map((l) => l.strongSE),
      colour: CHART_COLOURS.accent,
      symbol: 'circle',
    },
    {
      name: 'weak error',
      values: levels.map((l) => l.weakError),
      se: levels.map((l) => l.weakSE),
      colour: CHART_COLOURS.contrast,
      symbol: 'diamond',
    },
  ];
  for (const s of series) {
    traces.push({
      type: 'scatter',
      mode: 'lines+markers',
      x: h,
      y: s.values,
      name: s.name,
      marker: { color: s.colour, symbol: s.symbol, size: 7 },
      line: { color: s.colour, width: 1.6 },
      error_y: { type: 'data', array: s.se.map((e) => 2 * e), visible: true, color: s.colour, thickness: 1 },
    });
  }
  const coarsest = levels[0]!;
  const anchor = [coarsest.strongError, coarsest.weakError].find((e) => e > 0);
  if (anchor !== undefined) {
    for (const [order, dash] of [
      [0.5, 'dot'],
      [1, 'dash'],
    ] as const) {
      traces.push({
        type: 'scatter',
        mode: 'lines',
        x: h,
        y: h.map((step) => anchor * (step / coarsest.h) ** order),
        name: `slope ${order === 0.5 ? '1/2' : '1'}`,
        line: { color: CHART_COLOURS.reference, width: 1, dash },
        hoverinfo: 'skip',
      });
    }
  }
  const rows = levels.map((l) => [l.steps, l.h, l.strongError, l.strongSE, l.weakError, l.weakSE]);
  return {
    traces,
    layout: chartLayout(
      { title: 'step size h', type: 'log' },
      { title: `error in ${stateName} at the end time`, type: 'log' },
    ),
    ariaLabel: `Step-size study of ${stateName}: strong and weak error against step size at ${plural(levels.length, 'level')}, ${plural(result.paths, 'path')}`,
    caption: `Error bars: ±2 standard errors; grey lines: reference slopes 1/2 and 1; ${plural(result.paths, 'path')} per level`,
    csv: toCsv(['steps', 'h', 'strong_error', 'strong_se', 'weak_error', 'weak_se'], rows),
    fileName: fileNameFor(`step-size study ${stateName}`),
  };
}
