import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { findExampleSheet } from '@shared/examples/index';
import { createThreadPool } from '../../server/cli/thread-pool';
import { runSheetToJson } from '@shared/run/run-sheet';
import { scaleSheetPaths } from '@shared/run/scale';
import { appUrl, launchBrowser, signUp, uniqueEmail, watchPageErrors, withFailureShot } from './browser';

/**
 * One sheet, two runners: Chromium's worker pool through the sheet page, and the command-line
 * runner's worker_threads. Both go through the one orchestrator and must print the same digests.
 */
describe('the page in Chromium and the command-line runner', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('give the same digest for each simulation of an example sheet, on the wasm kernel', async () => {
    const doc = scaleSheetPaths(findExampleSheet('grazing-two-species')!.document, 0.1);
    const threads = createThreadPool(2);
    const runner = await runSheetToJson(doc, threads.executor).finally(() => threads.close());
    const expected = runner.cells.flatMap((cell) => ('digest' in cell ? [cell.digest] : []));
    expect(expected.length).toBeGreaterThan(0);

    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const errors = watchPageErrors(page);
    await withFailureShot(page, 'same-digests', async () => {
      await signUp(page, {
        email: uniqueEmail('digest'),
        name: 'Ines Harwood',
        password: 'meander-e2e-password',
      });
      await page.waitForURL(/\/sheets/);
      const response = await page.request.post(appUrl('/api/sheets'), {
        headers: { Origin: new URL(appUrl()).origin },
        data: { title: doc.title, document: doc },
      });
      expect(response.status()).toBe(201);
      const { id } = (await response.json()) as { id: string };
      await page.goto(appUrl(`/sheets/${id}`));
      await page.getByRole('button', { name: 'Run all' }).click();
      // Each simulation's reading view ends its summary line with the digest.
      const digests = page.locator('.summary-line code.digest');
      await expect.poll(() => digests.count(), { timeout: 60_000 }).toBe(expected.length);
      expect(await digests.allInnerTexts()).toEqual(expected);
      // The worker compiled and ran the wasm kernel under its CSP (no fallback to JavaScript).
      const kernels = await page.locator('.summary-line .kernel').allInnerTexts();
      expect(kernels).toEqual(expected.map(() => 'WebAssembly SIMD kernel'));
    });
    expect(errors).toEqual([]);
    await context.close();
  });
});
