import type { ChartBuild, ChartInput } from './chartSpec';
import { buildPathsChart } from './pathsChart';
import { buildFanChart } from './fanChart';
import { buildHistogramChart } from './histogramChart';
import { buildPhaseChart } from './phaseChart';

/** The chart of a chart cell, by its view. */
export function buildChart(input: ChartInput): ChartBuild {
  switch (input.chart.view) {
    case 'paths':
      return buildPathsChart(input);
    case 'fan':
      return buildFanChart(input);
    case 'histogram':
      return buildHistogramChart(input);
    case 'phase':
      return buildPhaseChart(input);
  }
}
