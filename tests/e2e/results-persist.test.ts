import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { appUrl, launchBrowser, signIn, signUp, uniqueEmail, withFailureShot } from './browser';

const PASSWORD = 'meander-e2e-password';

/** An invented sheet: the temperature anomaly of a lake relaxing towards zero under weather noise. */
function lakeSheet(relaxation: number) {
  return {
    schemaVersion: 1,
    title: 'Lake temperature anomaly',
    cells: [
      {
        id: 'params-lake',
        kind: 'params',
        params: [
          { name: 'relax', value: relaxation, unit: '1/day' },
          { name: 'gust', value: 0.35, unit: 'K/sqrt(day)' },
        ],
      },
      {
        id: 'model-lake',
        kind: 'model',
        name: 'Lake anomaly',
        states: [
          { name: 'T', unit: 'K', initial: '1.5', drift: '-relax * T', diffusion: { weather: 'gust' } },
        ],
        noises: [{ name: 'weather' }],
        calculus: 'ito',
      },
      {
        id: 'simulation-lake',
        kind: 'simulation',
        name: 'Ten days',
        model: 'model-lake',
        method: 'euler-maruyama',
        t0: 0,
        t1: 10,
        steps: 200,
        paths: 1000,
        seed: 8123,
        saveCount: 21,
        samplePaths: 5,
        boundaries: {},
        overrides: {},
      },
      {
        id: 'probe-warm',
        kind: 'probe',
        simulation: 'simulation-lake',
        quantity: 'exceedance',
        state: 'T',
        level: 0.5,
      },
    ],
  };
}

const digestOf = (page: Page) =>
  page.locator('article[data-cell-id="simulation-lake"] code.digest').first().textContent();

describe('results survive a reload and stay with the version they were saved with', () => {
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let sheetId: string;
  let digest: string | null;
  const email = uniqueEmail('persist');

  beforeAll(async () => {
    browser = await launchBrowser();
    context = await browser.newContext();
    page = await context.newPage();
    await signUp(page, { email, name: 'Ines Valdermark', password: PASSWORD });
    await page.waitForURL(/\/sheets/);
    const response = await page.request.post(appUrl('/api/sheets'), {
      data: { title: 'Lake temperature anomaly', document: lakeSheet(0.6) },
      headers: { Origin: new URL(appUrl()).origin },
    });
    expect(response.status()).toBe(201);
    sheetId = ((await response.json()) as { id: string }).id;
  });
  afterAll(async () => {
    await context?.close().catch(() => undefined);
    await browser?.close();
  });

  it('shows the last results again after a reload, as current, without running', async () => {
    await withFailureShot(page, 'persist-reload', async () => {
      await page.goto(appUrl(`/sheets/${sheetId}`));
      await page.getByLabel('Version 1').waitFor();
      await page.getByRole('button', { name: 'Run all' }).click();
      await page.locator('article[data-cell-id="simulation-lake"] code.digest').waitFor({ timeout: 60_000 });
      digest = await digestOf(page);
      expect(digest).toMatch(/^[0-9a-f]{8,}$/);

      await page.reload();
      await page.getByLabel('Version 1').waitFor();
      await page.locator('article[data-cell-id="simulation-lake"] code.digest').waitFor();
      expect(await digestOf(page)).toBe(digest);
      const card = page.locator('article[data-cell-id="simulation-lake"]');
      expect(await card.textContent()).not.toMatch(/stale|as saved with version/);
      expect(await page.locator('.cell-running').count()).toBe(0);
    });
  });

  it('opens an old version with the numbers saved with it, labelled with its number', async () => {
    await withFailureShot(page, 'persist-old-version', async () => {
      // Save version 2 from the page: it carries the summary of the results on screen.
      await page.getByRole('button', { name: 'Save version' }).click();
      await page.getByRole('textbox', { name: 'Message' }).fill('first run of the lake');
      await page.getByRole('button', { name: 'Save', exact: true }).click();
      await page.getByLabel('Version 2').waitFor();
      // Someone saves version 3 with a faster relaxation, and no results.
      const response = await page.request.post(appUrl(`/api/sheets/${sheetId}/versions`), {
        data: { baseVersion: 2, message: 'faster relaxation', document: lakeSheet(0.9) },
        headers: { Origin: new URL(appUrl()).origin },
      });
      expect(response.status()).toBe(201);

      // Another browser of the same person, with nothing cached, opens version 2.
      const fresh = await browser.newContext();
      try {
        const other = await fresh.newPage();
        await signIn(other, { email, password: PASSWORD });
        await other.waitForURL(/\/sheets/);
        await other.goto(appUrl(`/sheets/${sheetId}?version=2`));
        await other.getByText('You are reading version 2').waitFor();
        const card = other.locator('article[data-cell-id="simulation-lake"]');
        await card.getByText('as saved with version 2').waitFor();
        expect(await digestOf(other)).toBe(digest);
        await other
          .locator('article[data-cell-id="probe-warm"]')
          .getByText('as saved with version 2')
          .waitFor();
      } finally {
        await fresh.close();
      }

      // The newest version has no saved results and its inputs changed: nothing to show yet.
      await page.goto(appUrl(`/sheets/${sheetId}`));
      await page.getByLabel('Version 3').waitFor();
      const card = page.locator('article[data-cell-id="simulation-lake"]');
      // The card's reading comes after the header; wait for it rather than read too early.
      await card.getByText('not run yet').first().waitFor({ timeout: 20_000 });
      expect(await card.textContent()).toContain('not run yet');
    });
  });
});
