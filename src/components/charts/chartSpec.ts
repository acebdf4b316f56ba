import type { PlotLayout, PlotTrace } from 'plotly.js-dist-min';
import type { SimulationPlan, SimulationResult } from '@shared/engine';
import type { ChartCell, ModelCell } from '@shared/sheet/document';
import type { ObservedOverlay } from './observedOverlay';

/** Everything a chart shows, computed from a run without touching the DOM (so it is testable). */
export interface ChartSpec {
  traces: PlotTrace[];
  layout: PlotLayout;
  /** Says what the chart shows and over how many paths; the chart root's accessible name. */
  ariaLabel: string;
  caption: string;
  /** The data behind the chart. */
  csv: string;
  fileName: string;
  /** Something the reader should know (an overlay skipped, paths left out). */
  note?: string;
  /** A number read off the chart against observations (the fan's calibration read-out). */
  readout?: string;
}

export interface ChartInput {
  chart: ChartCell;
  result: SimulationResult;
  plan: SimulationPlan;
  /** The simulated model cell, for recognising a known law. */
  model?: ModelCell;
  /** Observed points of the chart's state, from the sheet's data cells. */
  observed?: ObservedOverlay | null;
}

export type ChartBuild = { ok: true; spec: ChartSpec } | { ok: false; message: string };

export function stateIndex(result: SimulationResult, name: string): number | null {
  const index = result.stateNames.indexOf(name);
  return index < 0 ? null : index;
}

export function unitOf(plan: SimulationPlan, index: number): string {
  return plan.model.stateUnits[index] ?? '';
}

/** The saved time nearest to t (saved times are the step times nearest an even grid). */
export function nearestSavedIndex(savedTimes: ArrayLike<number>, t: number): number {
  let best = 0;
  for (let k = 1; k < savedTimes.length; k += 1) {
    if (Math.abs(savedTimes[k]! - t) < Math.abs(savedTimes[best]! - t)) best = k;
  }
  return best;
}

export function plural(count: number, word: string): string {
  return `${count.toLocaleString('en')} ${word}${count === 1 ? '' : 's'}`;
}
