import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

const plotly = vi.hoisted(() => ({
  imports: 0,
  react: vi.fn(async (element: HTMLElement) => element),
  purge: vi.fn(),
}));
/** Fresh modules per test: the loader keeps Plotly (and its loading state) for the page's life. */
async function freshModules() {
  vi.resetModules();
  // Registered anew each time, so the count says whether this test's loader imported Plotly.
  vi.doMock('plotly.js-dist-min', () => {
    plotly.imports += 1;
    return { default: { react: plotly.react, purge: plotly.purge } };
  });
  const charts = await import('@/components/charts/usePlotly');
  const activity = await import('@/workers/activity');
  return { ...charts, ...activity };
}

/** Real turns of the event loop until the mocked module has been imported (module loading is real I/O). */
async function untilImported(): Promise<void> {
  for (let turn = 0; turn < 500 && plotly.imports === 0; turn += 1) {
    await new Promise((resolve) => setImmediate(resolve));
  }
}

beforeEach(() => {
  // Timers only: User Timing marks and setImmediate stay real.
  vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'setInterval', 'clearInterval'] });
  plotly.imports = 0;
  plotly.react.mockClear();
  plotly.purge.mockClear();
  performance.clearMarks();
});
afterEach(() => {
  vi.useRealTimers();
});

describe('loading Plotly while the page is idle', () => {
  it('waits while a run is going on, then loads and warms up off-screen and says so', async () => {
    const { preloadPlotlyWhenIdle, runStarted, CHARTS_READY_MARK } = await freshModules();
    const ended = runStarted();
    preloadPlotlyWhenIdle();
    // jsdom has no requestIdleCallback: the loader falls back to timers. Ten seconds of a run.
    await vi.advanceTimersByTimeAsync(10_000);
    expect(plotly.imports).toBe(0);
    expect(plotly.react).not.toHaveBeenCalled();

    ended();
    await vi.advanceTimersByTimeAsync(600);
    await untilImported();
    expect(plotly.imports).toBe(1);
    await vi.advanceTimersByTimeAsync(5_000);
    // Two throw-away draws on an element that is gone afterwards.
    expect(plotly.react).toHaveBeenCalledTimes(2);
    const host = plotly.react.mock.calls[0]![0];
    expect(host.getAttribute('aria-hidden')).toBe('true');
    expect(host.isConnected).toBe(false);
    expect(plotly.purge).toHaveBeenCalledWith(host);
    expect(performance.getEntriesByName(CHARTS_READY_MARK)).toHaveLength(1);
  });

  it('does not warm up while a run started between loading and drawing is going on', async () => {
    const { preloadPlotlyWhenIdle, runStarted } = await freshModules();
    preloadPlotlyWhenIdle();
    await vi.advanceTimersByTimeAsync(600);
    await untilImported();
    expect(plotly.imports).toBe(1);
    const ended = runStarted();
    await vi.advanceTimersByTimeAsync(10_000);
    expect(plotly.react).not.toHaveBeenCalled();
    ended();
    await vi.advanceTimersByTimeAsync(5_000);
    expect(plotly.react).toHaveBeenCalledTimes(2);
  });

  it('loads and warms up once when several charts ask for it as they mount', async () => {
    const { preloadPlotlyWhenIdle } = await freshModules();
    preloadPlotlyWhenIdle();
    preloadPlotlyWhenIdle();
    preloadPlotlyWhenIdle();
    await vi.advanceTimersByTimeAsync(600);
    await untilImported();
    await vi.advanceTimersByTimeAsync(5_000);
    expect(plotly.imports).toBe(1);
    expect(plotly.react).toHaveBeenCalledTimes(2);
  });

  it('counts overlapping runs, and ending one twice does not end another', async () => {
    const { runStarted, runsActive } = await freshModules();
    const first = runStarted();
    const second = runStarted();
    first();
    first();
    expect(runsActive()).toBe(true);
    second();
    expect(runsActive()).toBe(false);
  });
});
