import type { PlotLayout } from 'plotly.js-dist-min';
import { palette } from '@/styles/palette';

/** Meander's chart look: sand paper, ink text, the one accent and a few quiet companions. */
export const CHART_FONT = "'Source Sans 3', system-ui, sans-serif";
export const CHART_COLOURS = {
  accent: palette.accent,
  accentSoft: palette.accentSoft,
  ink: palette.ink,
  inkSoft: palette.inkSoft,
  paper: palette.paper,
  sand: palette.sand,
  rule: palette.rule,
  contrast: palette.warning,
  reference: palette.inkFaint,
};

/** Path colours: the accent first, then muted earth and water tones that stay distinct. */
export const PATH_COLOURS = [
  '#1d6a64',
  '#2c5f86',
  '#9a6512',
  '#7c4b72',
  '#5a7d36',
  '#a63a2c',
  '#56656e',
  '#b07d22',
];

export function axisTitle(name: string, unit: string | undefined): string {
  return unit ? `${name} (${unit})` : name;
}

export interface AxisOptions {
  title: string;
  type?: 'linear' | 'log';
}

export function chartLayout(x: AxisOptions, y: AxisOptions, extra: PlotLayout = {}): PlotLayout {
  const axis = (options: AxisOptions) => ({
    title: { text: options.title, font: { size: 13 } },
    type: options.type ?? 'linear',
    gridcolor: CHART_COLOURS.rule,
    zerolinecolor: CHART_COLOURS.rule,
    linecolor: CHART_COLOURS.inkSoft,
    ticks: 'outside',
    tickcolor: CHART_COLOURS.inkSoft,
    exponentformat: 'power',
    // Labels stay where they fall: checking each one for overflow measures every label's box,
    // a forced layout per tick on every draw, and the margins already leave room for them.
    ticklabeloverflow: 'allow',
  });
  return {
    font: { family: CHART_FONT, color: CHART_COLOURS.ink, size: 12 },
    paper_bgcolor: CHART_COLOURS.sand,
    plot_bgcolor: CHART_COLOURS.paper,
    margin: { l: 64, r: 16, t: 24, b: 52 },
    xaxis: axis(x),
    yaxis: axis(y),
    legend: { orientation: 'h', y: -0.22, bgcolor: 'rgba(0,0,0,0)' },
    hovermode: 'closest',
    ...extra,
  };
}

/**
 * Plotly's own toolbar is off: Meander's ChartToolbar gives the few actions it needs, and no chart
 * ever offers to send its data to an outside service (no link, no "send data", no edit link).
 */
export const CHART_CONFIG = {
  displayModeBar: false,
  displaylogo: false,
  showLink: false,
  sendData: false,
  showSendToCloud: false,
  showEditInChartStudio: false,
  responsive: true,
} as const;
