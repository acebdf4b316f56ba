import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import AxeBuilder from '@axe-core/playwright';
import type { Browser, Page } from 'playwright-core';
import { appUrl, launchBrowser, signUp, uniqueEmail, watchPageErrors, withFailureShot } from './browser';

/**
 * A fit end to end in Chromium: the pond-oxygen demo (invented data) comes in as a sheet file,
 * its fit cell runs in the worker pool and shows estimates with errors, "Use these values" writes
 * them into the parameters cell (undoable), and a rerun of the simulation uses them.
 */
const demoFile = readFileSync(
  new URL('../../shared/examples/sheet-files/pond-oxygen.meander.json', import.meta.url),
);

/** No serious or critical axe-core violation (WCAG 2.1 A/AA and best practice), as in accessibility.test.ts. */
async function audit(page: Page): Promise<void> {
  const results = await new AxeBuilder({ page })
    .withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'best-practice'])
    .analyze();
  const grave = results.violations
    .filter((violation) => violation.impact === 'serious' || violation.impact === 'critical')
    .map((violation) => ({
      rule: violation.id,
      targets: violation.nodes.slice(0, 5).map((n) => n.target.join(' ')),
    }));
  expect(grave, JSON.stringify(grave, null, 1)).toEqual([]);
}

describe('fitting a model to observed data', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('fits, reads the estimates, uses them in the parameters and reruns', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const errors = watchPageErrors(page);
    await withFailureShot(page, 'fit', async () => {
      await signUp(page, {
        email: uniqueEmail('hydrologist'),
        name: 'Ilse Marram',
        password: 'meander-e2e-password',
      });
      await page.goto(appUrl('/sheets'));
      await page.getByLabel('Import a sheet file').setInputFiles({
        name: 'pond-oxygen.meander.json',
        mimeType: 'application/json',
        buffer: demoFile,
      });
      await page.waitForURL((url) => /\/sheets\/[^/]+$/.test(url.pathname));

      await page.getByRole('button', { name: 'Run fit cell' }).click();
      const fitCard = page.locator('[data-cell-id="pond-fit"]');
      const table = fitCard.getByRole('table');
      await table.waitFor({ timeout: 90_000 });
      const kappaRow = await table.getByRole('row', { name: /^kappa/ }).innerText();
      // κ was 0.35 per day in the invented data (scripts/pond-oxygen-data.ts); the interval holds it.
      const [low, high] = (kappaRow.match(/(\d+\.\d+) to (\d+\.\d+)/) ?? []).slice(1).map(Number);
      expect(low).toBeLessThan(0.35);
      expect(high).toBeGreaterThan(0.35);
      expect(await fitCard.innerText()).toMatch(
        /converged: a fresh search from the best point found nothing better/,
      );
      const kappa = Number(kappaRow.split(/\s+/)[1]);
      await fitCard.screenshot({ path: new URL('./screenshots/fit-cell.png', import.meta.url).pathname });
      await page.getByRole('button', { name: 'Edit fit cell' }).click();
      await fitCard.getByRole('group', { name: 'Parameters to estimate' }).waitFor();
      await audit(page);
      await page.getByRole('button', { name: 'Edit fit cell' }).click();

      await fitCard.getByRole('button', { name: 'Use these values' }).click();
      const undoBar = page.getByRole('status').filter({ hasText: 'Used the fitted values' });
      await undoBar.waitFor();
      expect(await undoBar.innerText()).toMatch(/kappa 0\.25 → 0\.\d+/);
      const paramsCard = page.locator('[data-cell-id="pond-params"]');
      await expect.poll(() => paramsCard.innerText()).toContain(String(kappa).slice(0, 4));

      // Undo puts the first guess back; using the values again keeps them.
      await undoBar.getByRole('button', { name: 'Undo' }).click();
      await expect.poll(() => paramsCard.innerText()).toMatch(/0\.25/);
      await fitCard.getByRole('button', { name: 'Run fit cell' }).click();
      await fitCard.getByRole('button', { name: 'Use these values' }).click();
      await page.getByRole('status').filter({ hasText: 'Used the fitted values' }).waitFor();

      await page.getByRole('button', { name: 'Run simulation cell' }).click();
      const readout = page.getByRole('status').filter({ hasText: /^Calibration:/ });
      await readout.waitFor({ timeout: 60_000 });
      expect(await readout.innerText()).toMatch(/^Calibration: \d+ of 122 observed points/);
    });
    expect(errors).toEqual([]);
    await context.close();
  });
});
