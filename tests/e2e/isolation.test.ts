import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { appUrl, launchBrowser, signUp, uniqueEmail, watchPageErrors, withFailureShot } from './browser';

/**
 * The page is cross-origin isolated (COOP same-origin, COEP require-corp): everything it loads
 * must still load: the fonts, the lazily loaded Plotly chunk, the simulation workers.
 */
describe('cross-origin isolation', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('is isolated, and fonts, the chart library and the workers still load and run', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const errors = watchPageErrors(page);
    const failed: string[] = [];
    page.on('requestfailed', (request) => failed.push(`${request.url()}: ${request.failure()?.errorText}`));
    page.on('response', (response) => {
      if (response.status() >= 400 && !response.url().endsWith('/api/auth/me'))
        failed.push(`${response.url()}: ${response.status()}`);
    });
    await withFailureShot(page, 'isolation', async () => {
      await signUp(page, {
        email: uniqueEmail('isolated'),
        name: 'Ona Reyes',
        password: 'meander-e2e-password',
      });
      // Let the sheet list finish loading, so that leaving it aborts no request of its own.
      await page.waitForLoadState('networkidle');
      const created = await page.request.post(appUrl('/api/sheets'), {
        headers: { Origin: new URL(appUrl()).origin },
        data: {
          title: 'Isolated run',
          document: {
            schemaVersion: 1,
            title: 'Isolated run',
            cells: [
              { id: 'p', kind: 'params', params: [{ name: 'rate', value: 0.8 }] },
              {
                id: 'm',
                kind: 'model',
                states: [{ name: 'h', initial: '2', drift: '-rate * h', diffusion: { N: '0.3' } }],
                noises: [{ name: 'N' }],
              },
              { id: 's', kind: 'simulation', model: 'm', t1: 2, steps: 200, paths: 20_000, seed: 4411 },
              { id: 'c', kind: 'chart', simulation: 's', view: 'fan', state: 'h' },
            ],
          },
        },
      });
      expect(created.status()).toBe(201);
      const { id } = (await created.json()) as { id: string };
      await page.goto(appUrl(`/sheets/${id}`));
      await page.getByRole('button', { name: 'Run all' }).click();
      await page.waitForFunction(
        () =>
          performance.getEntriesByName('meander:simulation-finished').length > 0 &&
          document.querySelector('[aria-label^="Quantile fan of h"] svg .scatterlayer .trace') !== null,
        null,
        { polling: 250, timeout: 60_000 },
      );
      const state = await page.evaluate(async () => {
        await document.fonts.ready;
        return {
          isolated: window.crossOriginIsolated,
          sharedMemory: typeof SharedArrayBuffer === 'function',
          loadedFonts: [...document.fonts]
            .filter((font) => font.status === 'loaded')
            .map((font) => font.family),
        };
      });
      expect(state.isolated).toBe(true);
      expect(state.sharedMemory).toBe(true);
      expect(state.loadedFonts.some((family) => family.includes('Source Sans 3'))).toBe(true);
      expect(failed).toEqual([]);
      expect(errors).toEqual([]);
    });
    await context.close();
  });
});
