import type { FitResult } from '@shared/fit/problem';
import { chartLayout, CHART_COLOURS } from './chartTheme';
import { toCsv, fileNameFor } from './chartCsv';
import type { ChartSpec } from './chartSpec';

/**
 * The fit's standardised residuals against standard normal quantiles (a QQ plot): points on the
 * diagonal mean the one-step transitions look Gaussian as the fitted model says.
 */
export function buildQqChart(result: FitResult, title: string): ChartSpec | null {
  const { qq } = result.residuals;
  if (qq.length < 2) return null;
  const x = qq.map(([theoretical]) => theoretical);
  const y = qq.map(([, sample]) => sample);
  const ends = [Math.min(...x, ...y), Math.max(...x, ...y)];
  return {
    traces: [
      {
        type: 'scatter',
        mode: 'markers',
        x,
        y,
        name: 'residuals',
        marker: { color: CHART_COLOURS.accent, size: 5 },
      },
      {
        type: 'scatter',
        mode: 'lines',
        x: ends,
        y: ends,
        name: 'standard normal',
        line: { color: CHART_COLOURS.reference, width: 1, dash: 'dash' },
        hoverinfo: 'skip',
      },
    ],
    layout: chartLayout({ title: 'standard normal quantile' }, { title: 'standardised residual' }),
    ariaLabel: `Normal QQ plot of ${result.residuals.count} standardised residuals of the fit ${title}`,
    caption: `Residuals from ${result.residuals.basis}; dashed: the diagonal a standard normal sample follows`,
    csv: toCsv(
      ['normal_quantile', 'residual'],
      qq.map(([a, b]) => [a, b]),
    ),
    fileName: fileNameFor(`fit residuals ${title}`),
  };
}
