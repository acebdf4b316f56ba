import type { CellOutput } from '@shared/run/outputs';
import { observedPoints } from '@shared/data/observe';
import type { ChartCell, SheetDocument } from '@shared/sheet/document';
import { CHART_COLOURS } from './chartTheme';

/** Observed points of the chart's state, from every data cell that maps that state of its model. */
export interface ObservedOverlay {
  /** The datasets' names, for the legend. */
  label: string;
  unit: string;
  times: number[];
  values: number[];
  groups: (string | null)[];
}

export function observedOverlayFor(
  document: SheetDocument,
  outputs: Record<string, CellOutput | undefined>,
  chart: ChartCell,
): ObservedOverlay | null {
  const simulation = document.cells.find((cell) => cell.id === chart.simulation);
  if (simulation?.kind !== 'simulation') return null;
  const overlay: ObservedOverlay = { label: '', unit: '', times: [], values: [], groups: [] };
  const names: string[] = [];
  for (const cell of document.cells) {
    if (cell.kind !== 'data' || cell.model !== simulation.model) continue;
    const output = outputs[cell.id];
    if (output?.kind !== 'data') continue;
    const column = output.observed.columns.find((entry) => entry.state === chart.state);
    if (!column) continue;
    const points = observedPoints(output.observed, chart.state);
    overlay.times.push(...points.times);
    overlay.values.push(...points.values);
    overlay.groups.push(...points.groups);
    overlay.unit ||= column.unit;
    names.push(output.observed.name);
  }
  if (overlay.times.length === 0) return null;
  overlay.label = `observed (${names.join(', ')})`;
  return overlay;
}

/** Observed points as markers over paths or a fan. */
export function observedMarkers(overlay: ObservedOverlay, state: string): Record<string, unknown> {
  return {
    type: 'scatter',
    mode: 'markers',
    x: overlay.times,
    y: overlay.values,
    text: overlay.groups.map((group) => group ?? ''),
    name: overlay.label,
    marker: {
      color: CHART_COLOURS.contrast,
      size: 6,
      symbol: 'diamond',
      line: { color: '#ffffff', width: 0.8 },
    },
    hovertemplate: `%{text} t = %{x:.4g}<br>${state} observed = %{y:.4g}${overlay.unit ? ` ${overlay.unit}` : ''}<extra></extra>`,
  };
}

/** The unit of the observations when the model gives its state none, else the model's. */
export function unitWithObserved(modelUnit: string, overlay: ObservedOverlay | null | undefined): string {
  return modelUnit || overlay?.unit || '';
}

/** Rows appended to a chart's CSV: the observations, in columns of their own after `width` blanks. */
export function observedCsvRows(overlay: ObservedOverlay, width: number): (number | string)[][] {
  return overlay.times.map((t, i) => [
    t,
    ...Array.from({ length: width }, () => ''),
    overlay.groups[i] ?? '',
    overlay.values[i]!,
  ]);
}

/** Column names of the observations in a chart's CSV, the unit in brackets. */
export function observedCsvHeader(overlay: ObservedOverlay, state: string): string[] {
  return ['observed_group', `observed_${state}${overlay.unit ? ` [${overlay.unit}]` : ''}`];
}
