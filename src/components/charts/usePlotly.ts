import { onScopeDispose, ref, shallowRef } from 'vue';
import type { PlotlyStatic } from 'plotly.js-dist-min';

/** Plotly is 4.6 MB: fetched once, on the first chart, as its own chunk. */
let loading: Promise<PlotlyStatic> | null = null;

function loadPlotly(): Promise<PlotlyStatic> {
  loading ??= import('plotly.js-dist-min')
    .then((module) => module.default)
    .catch((error: unknown) => {
      loading = null; // let a later chart try again (e.g. after a network hiccup)
      throw error;
    });
  return loading;
}

/**
 * Starts loading Plotly once the page is idle, so a sheet with charts has it ready before its
 * first run ends: evaluating a 4.6 MB script is one long main-thread task, and it should not land
 * in the middle of a run.
 */
export function preloadPlotlyWhenIdle(): void {
  if (loading) return;
  const start = () => void loadPlotly().catch(() => undefined);
  if (typeof requestIdleCallback === 'function') requestIdleCallback(start, { timeout: 3000 });
  else setTimeout(start, 500);
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
