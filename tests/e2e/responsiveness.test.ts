import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { appUrl, launchBrowser, signUp, uniqueEmail, withFailureShot } from './browser';

declare global {
  interface Window {
    meanderLongTasks: { start: number; duration: number }[];
  }
}

/** A one-state Ornstein–Uhlenbeck sheet (invented numbers) with a fan chart and a probe. */
async function createSheet(page: Page, simulation: { paths: number; saveCount: number }): Promise<string> {
  const response = await page.request.post(appUrl('/api/sheets'), {
    headers: { Origin: new URL(appUrl()).origin },
    data: {
      title: 'Reservoir inflow anomaly',
      document: {
        schemaVersion: 1,
        title: 'Reservoir inflow anomaly',
        cells: [
          {
            id: 'p',
            kind: 'params',
            params: [
              { name: 'kappa', value: 0.6 },
              { name: 'nu', value: 0.45 },
            ],
          },
          {
            id: 'm',
            kind: 'model',
            states: [{ name: 'q', initial: '1.5', drift: '-kappa * q', diffusion: { B: 'nu' } }],
            noises: [{ name: 'B' }],
          },
          { id: 's', kind: 'simulation', model: 'm', t1: 4, steps: 400, seed: 20261202, ...simulation },
          { id: 'c', kind: 'chart', simulation: 's', view: 'fan', state: 'q' },
          { id: 'x', kind: 'probe', simulation: 's', quantity: 'exceedance', state: 'q', level: 1 },
        ],
      },
    },
  });
  expect(response.status()).toBe(201);
  return ((await response.json()) as { id: string }).id;
}

/**
 * The main thread must stay responsive while the worker pool runs 100,000 paths. Long tasks
 * (over 50 ms, the Long Tasks API's own threshold) are recorded over a first run and two reruns,
 * split at the moment the result is back (the run itself, then drawing its results), and
 * reported; the figures are written beside the test results rather than asserted as times, since
 * timings on a shared machine are for benchmarks, not tests. What is asserted: the browser
 * reports long tasks at all (so the measurement is real) and each run finishes with every path.
 */
describe('responsiveness during a large run', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('runs 100,000 paths in workers and records the longest main-thread task', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await page.addInitScript(() => {
      window.meanderLongTasks = [];
      new PerformanceObserver((list) => {
        for (const entry of list.getEntries())
          window.meanderLongTasks.push({ start: entry.startTime, duration: entry.duration });
      }).observe({ type: 'longtask', buffered: true });
    });
    await withFailureShot(page, 'responsiveness', async () => {
      await signUp(page, {
        email: uniqueEmail('big-run'),
        name: 'Lea Brandt',
        password: 'meander-e2e-password',
      });
      await page.waitForURL(/\/sheets/);
      const id = await createSheet(page, { paths: 100_000, saveCount: 101 });
      // A sheet with a chart loads the chart library while the page is idle after opening, then
      // warms it up with two throw-away draws; a reader looks at the sheet before running it.
      await page.goto(appUrl(`/sheets/${id}`));
      await page.getByRole('button', { name: 'Run all' }).waitFor();
      await page.waitForFunction(
        () => performance.getEntriesByName('meander:charts-ready').length > 0,
        null,
        { polling: 250, timeout: 30_000 },
      );
      const supported = await page.evaluate(() =>
        PerformanceObserver.supportedEntryTypes.includes('longtask'),
      );
      expect(supported).toBe(true);
      const longest = (durations: number[]) => Math.round(Math.max(0, ...durations));
      // Opening the page: Plotly's evaluation and its warm-up draws fall here, while idle.
      const pageOpen = await page.evaluate(() => window.meanderLongTasks);
      /** Long tasks as [start after the key press, duration], in whole milliseconds. */
      type Timed = [number, number];
      const runs: { duringRun: Timed[]; drawingResults: Timed[] }[] = [];
      // A first run and two reruns: the first pays for code the page has not run yet.
      for (let round = 0; round < 3; round += 1) {
        await page.evaluate(() => {
          window.meanderLongTasks = [];
          performance.clearMarks('meander:simulation-finished');
        });
        // Start the run from the keyboard: Playwright's mouse click runs hit-target checks on the
        // page's main thread, which on a large page are a long task of the harness's own.
        await page.getByRole('button', { name: 'Run all' }).focus();
        const pressedAt = await page.evaluate(() => performance.now());
        await page.keyboard.press('Enter');
        // Wait with a cheap check every 250 ms: Playwright's role queries run on the page's main
        // thread and, polled often over a large page, would add long tasks of their own. Done
        // means: the run has finished and the fan chart has lines in it.
        await page.waitForFunction(
          () =>
            performance.getEntriesByName('meander:simulation-finished').length > 0 &&
            document.querySelector('[aria-label^="Quantile fan of q"] svg .scatterlayer .trace') !== null,
          null,
          { polling: 250, timeout: 110_000 },
        );
        // Long-task entries arrive after their task ends; give the last draw time to be reported.
        await page.waitForTimeout(1000);
        expect(await page.getByRole('status', { name: 'Probe result' }).innerText()).toMatch(
          /from 100,000 paths/,
        );
        const longTasks = await page.evaluate(() => window.meanderLongTasks);
        // The pool marks the moment the merged result is back (src/workers/pool.ts); tasks that
        // start before it belong to the run, tasks after it draw the results.
        const finishedAt = await page.evaluate(
          () => performance.getEntriesByName('meander:simulation-finished').at(-1)!.startTime,
        );
        const timed = (task: { start: number; duration: number }): Timed => [
          Math.round(task.start - pressedAt),
          Math.round(task.duration),
        ];
        runs.push({
          duringRun: longTasks.filter((task) => task.start < finishedAt).map(timed),
          drawingResults: longTasks.filter((task) => task.start >= finishedAt).map(timed),
        });
      }
      await expect.poll(() => page.getByRole('img', { name: /^Quantile fan of q/ }).count()).toBe(1);
      console.info(
        JSON.stringify({
          measure: 'main-thread long tasks (> 50 ms) around a 100,000-path run',
          tasks: '[start after the key press, duration] in ms',
          pageOpen: {
            count: pageOpen.length,
            longestMs: longest(pageOpen.map((task) => task.duration)),
          },
          runs: runs.map((run) => ({
            duringRunLongestMs: longest(run.duringRun.map(([, ms]) => ms)),
            drawingResultsLongestMs: longest(run.drawingResults.map(([, ms]) => ms)),
            tasks: run,
          })),
        }),
      );
    });
    await context.close();
  });

  it('stops a 1,000,000-path run on "Cancel run" and reports how long the stop took', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await withFailureShot(page, 'cancel-latency', async () => {
      await signUp(page, {
        email: uniqueEmail('cancel-run'),
        name: 'Ivo Marsh',
        password: 'meander-e2e-password',
      });
      await page.waitForURL(/\/sheets/);
      // 4 × 10⁸ path-steps: tens of seconds on this machine, so the cancel lands mid-run.
      const id = await createSheet(page, { paths: 1_000_000, saveCount: 2 });
      await page.goto(appUrl(`/sheets/${id}`));
      await page.getByRole('button', { name: 'Run all' }).click();
      const cancel = page.getByRole('button', { name: 'Cancel run' });
      await cancel.waitFor();
      await page.getByRole('progressbar', { name: 'Run progress' }).waitFor();
      await page.waitForTimeout(1500);
      // Click and wait for the page to say the run stopped, timed inside the page.
      const stopMs = await page.evaluate(async () => {
        const button = [...document.querySelectorAll('button')].find(
          (element) => element.textContent?.trim() === 'Cancel run',
        )!;
        const stopped = () => document.body.textContent?.includes('Run cancelled') ?? false;
        const started = performance.now();
        button.click();
        await new Promise<void>((resolve) => {
          if (stopped()) return resolve();
          const observer = new MutationObserver(() => {
            if (!stopped()) return;
            observer.disconnect();
            resolve();
          });
          observer.observe(document.body, { subtree: true, childList: true, characterData: true });
        });
        return performance.now() - started;
      });
      // Stopped for real: no result, the run can start again.
      expect(await page.getByRole('status', { name: 'Probe result' }).count()).toBe(0);
      await expect.poll(() => page.getByRole('button', { name: 'Run all' }).isEnabled()).toBe(true);
      await expect.poll(() => page.getByRole('button', { name: 'Cancel run' }).count()).toBe(0);
      console.info(
        JSON.stringify({ measure: 'Cancel run: click to "Run cancelled" shown', ms: Math.round(stopMs) }),
      );
    });
    await context.close();
  });
});
