import { onScopeDispose, ref, shallowRef } from 'vue';
import type { PlotlyStatic, PlotTrace } from 'plotly.js-dist-min';
import { chartLayout, CHART_CONFIG } from './chartTheme';
import { runsActive } from '@/workers/activity';

/** A User Timing mark set when Plotly is loaded and warmed up (see warmUp). */
export const CHARTS_READY_MARK = 'meander:charts-ready';

/** Plotly is 4.6 MB: fetched once, on the first chart, as its own chunk. */
let loading: Promise<PlotlyStatic> | null = null;
let preloadScheduled = false;

function loadPlotly(): Promise<PlotlyStatic> {
  loading ??= import('plotly.js-dist-min')
    .then((module) => module.default)
    .catch((error: unknown) => {
      loading = null; // let a later chart try again (e.g. after a network hiccup)
      throw error;
    });
  return loading;
}

/** Runs `job` at an idle moment when no simulation is running in the workers. */
function whenIdle(job: () => void): void {
  const attempt = () => (runsActive() ? setTimeout(() => whenIdle(job), 250) : job());
  if (typeof requestIdleCallback === 'function') requestIdleCallback(attempt, { timeout: 3000 });
  else setTimeout(attempt, 500);
}

/**
 * Draws a small chart off-screen twice, in two idle moments, and throws it away. The first Plotly
 * draws on a page take two to three times as long as later ones (its code runs for the first
 * time); paying that while the page is idle keeps it out of the moment a run's results appear.
 * The chart has the kinds of trace Meander draws: lines, a filled band, bars and a legend.
 */
async function warmUp(plotly: PlotlyStatic): Promise<void> {
  const host = document.createElement('div');
  host.setAttribute('aria-hidden', 'true');
  host.style.cssText =
    'position:fixed;left:-10000px;top:0;width:640px;height:340px;visibility:hidden;contain:strict';
  document.body.append(host);
  const x = Array.from({ length: 101 }, (_, k) => k / 25);
  const curve = (shift: number) => x.map((t) => Math.sin(t + shift) + shift);
  const traces = (shift: number): PlotTrace[] => [
    { type: 'scatter', mode: 'lines', x, y: curve(shift), line: { width: 0 }, showlegend: false },
    { type: 'scatter', mode: 'lines', x, y: curve(shift + 1), fill: 'tonexty', name: 'band' },
    { type: 'scatter', mode: 'lines', x, y: curve(shift + 0.5), name: 'line' },
    { type: 'bar', x: x.slice(0, 20), y: curve(shift).slice(0, 20), name: 'bars' },
  ];
  const layout = chartLayout({ title: 'x' }, { title: 'y' });
  try {
    await plotly.react(host, traces(0), layout, CHART_CONFIG);
    await new Promise((resolve) => whenIdle(() => resolve(undefined)));
    await plotly.react(host, traces(1), layout, CHART_CONFIG);
  } finally {
    plotly.purge(host);
    host.remove();
  }
  performance.mark(CHARTS_READY_MARK);
}

/**
 * Starts loading Plotly once the page is idle, so a sheet with charts has it ready before its
 * first run ends: evaluating a 4.6 MB script is one long main-thread task (1.5–2.2 s on the test
 * machine), and it should not land in the middle of a run, so it also waits while one goes on.
 * Then it warms Plotly up (see warmUp), in idle moments too.
 */
export function preloadPlotlyWhenIdle(): void {
  // Every chart and study cell asks as it mounts: load and warm up once per page.
  if (loading || preloadScheduled) return;
  preloadScheduled = true;
  whenIdle(() => {
    loadPlotly().then(
      (plotly) => whenIdle(() => void warmUp(plotly).catch(() => undefined)),
      () => undefined,
    );
  });
}

/**
 * Plotly for one chart: `plotly` is null until loaded, `error` says why it could not load. The
 * element given to `track` is purged when the component's scope ends, so no listeners leak.
 */
export function usePlotly() {
  const plotly = shallowRef<PlotlyStatic | null>(null);
  const error = ref<string | null>(null);
  let tracked: HTMLElement | null = null;

  loadPlotly().then(
    (module) => {
      plotly.value = module;
    },
    (reason: unknown) => {
      error.value = `The chart library could not load (${reason instanceof Error ? reason.message : String(reason)}). Reload the page to try again.`;
    },
  );

  function track(element: HTMLElement): void {
    tracked = element;
  }

  onScopeDispose(() => {
    if (tracked && plotly.value) plotly.value.purge(tracked);
  });

  return { plotly, error, track };
}
