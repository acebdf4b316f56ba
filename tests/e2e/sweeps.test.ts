import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { findExampleSheet } from '@shared/examples/index';
import { scaleSheetPaths } from '@shared/run/scale';
import { appUrl, launchBrowser, signUp, uniqueEmail, watchPageErrors, withFailureShot } from './browser';

/**
 * A sweep and a scenarios cell built by hand on the fish-stock demo (its own sweep, plans and
 * study left out, paths scaled down), run in the browser's worker pool; then a long sweep cancelled.
 */
const LEFT_OUT = new Set(['harvest-sweep-note', 'harvest-sweep', 'management-plans', 'stock-study']);

async function createDemo(page: Page): Promise<string> {
  const demo = scaleSheetPaths(findExampleSheet('harvested-fish-stock')!.document, 0.05);
  const doc = {
    ...demo,
    cells: demo.cells.filter((cell) => !LEFT_OUT.has(cell.id) && cell.kind !== 'study'),
  };
  const response = await page.request.post(appUrl('/api/sheets'), {
    headers: { Origin: new URL(appUrl()).origin },
    data: { title: 'Harvest limits by hand', document: doc },
  });
  expect(response.status()).toBe(201);
  return ((await response.json()) as { id: string }).id;
}

async function addCell(page: Page, item: string): Promise<void> {
  await page.getByRole('button', { name: 'Add cell', exact: true }).click();
  await page.getByRole('menuitem', { name: item, exact: true }).click();
}

const field = (page: Page, name: string) => page.getByRole('textbox', { name, exact: true });

/** Opens the card's editor unless it is open already (the button toggles). */
async function openEditor(page: Page, word: string): Promise<void> {
  const toggle = page.getByRole('button', { name: `Edit ${word} cell`, exact: true });
  if ((await toggle.getAttribute('aria-pressed')) !== 'true') await toggle.click();
}

describe('sweeps and scenarios in the browser', () => {
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    page = await context.newPage();
    await signUp(page, {
      email: uniqueEmail('sweep'),
      name: 'Ines Halvorsen',
      password: 'meander-e2e-password',
    });
    await page.waitForURL(/\/sheets/);
  });
  afterAll(async () => {
    await context?.close().catch(() => undefined);
    await browser?.close();
  });

  it('builds a sweep with a target and a scenarios cell, reads the answers, and cancels a long sweep', async () => {
    const errors = watchPageErrors(page);
    await withFailureShot(page, 'sweeps', async () => {
      const id = await createDemo(page);
      await page.goto(appUrl(`/sheets/${id}`));
      await page.getByRole('button', { name: 'Run all' }).waitFor();

      // A sweep of the harvest rate against the collapse probability, with a target of 5 %.
      await addCell(page, 'Sweep');
      await openEditor(page, 'sweep');
      await page
        .getByRole('combobox', { name: 'Probe to sweep' })
        .selectOption({ label: 'extinction probability of N' });
      await page.getByRole('combobox', { name: 'First parameter: parameter' }).selectOption('h');
      await field(page, 'First parameter: from').fill('0');
      await field(page, 'First parameter: to').fill('0.4');
      await field(page, 'First parameter: count').fill('5');
      await field(page, 'Paths per value').fill('800');
      await page.getByRole('checkbox', { name: /meets a target/ }).click();
      await field(page, 'Target value').fill('0.05');
      await field(page, 'Refined runs').fill('2');
      await page.getByRole('button', { name: 'Run sweep cell' }).click();
      const answer = page.getByRole('status', { name: 'Target search result' });
      await answer.waitFor({ timeout: 120_000 });
      const text = await answer.innerText();
      expect(text).toMatch(/target 0\.05/);
      const match = /([\d.]+) · interval \[([\d.]+), ([\d.]+)\]/.exec(text);
      expect(match, text).not.toBeNull();
      const [root, low, high] = match!.slice(1).map(Number) as [number, number, number];
      expect(low).toBeLessThanOrEqual(root);
      expect(high).toBeGreaterThanOrEqual(root);
      expect(root).toBeGreaterThan(0);
      expect(root).toBeLessThan(0.4);
      await page.getByRole('table', { name: /^Sweep table/ }).waitFor();
      await page
        .getByRole('img', { name: /^Sweep of h/ })
        .locator('.main-svg')
        .first()
        .waitFor({ timeout: 60_000 });
      await page
        .getByRole('article', { name: /^Sweep cell/ })
        .screenshot({ path: new URL('./screenshots/sweep-target.png', import.meta.url).pathname });

      // Three scenarios: the present rate as baseline, and two invented plans.
      await addCell(page, 'Scenarios');
      await openEditor(page, 'scenarios');
      await field(page, 'Paths per scenario').fill('800');
      await page.getByRole('button', { name: 'Add a scenario' }).click();
      await field(page, 'plan 2: h').fill('0.1');
      await page.getByRole('button', { name: 'Add a scenario' }).click();
      await field(page, 'plan 3: h').fill('0.35');
      await page.getByRole('button', { name: 'Run scenarios cell' }).click();
      const table = page.getByRole('table', { name: 'Scenario comparison' });
      await table.waitFor({ timeout: 120_000 });
      const rows = await table.innerText();
      expect(rows).toMatch(/plan 2/);
      expect(rows).toMatch(/plan 3/);
      expect(rows).toMatch(/(beyond|within) noise/);
      expect(await page.getByRole('img', { name: /^Fans of N for 3 scenarios/ }).count()).toBe(1);
      await page
        .getByRole('img', { name: /^extinction probability of N for 3 scenarios/ })
        .locator('.main-svg')
        .first()
        .waitFor({ timeout: 60_000 });
      await page
        .getByRole('article', { name: /^Scenarios cell/ })
        .screenshot({ path: new URL('./screenshots/scenarios.png', import.meta.url).pathname });

      // A long sweep: the progress names the point; Cancel run stops it and keeps the sheet usable.
      await openEditor(page, 'sweep');
      await field(page, 'First parameter: count').fill('20');
      await field(page, 'Paths per value').fill('200000');
      await page.getByRole('button', { name: 'Run sweep cell' }).click();
      await page.locator('[role="progressbar"][aria-valuetext*="point"]').waitFor({ timeout: 60_000 });
      expect(
        await page.getByRole('progressbar', { name: 'Run progress' }).getAttribute('aria-valuetext'),
      ).toMatch(/point \d+ of 22/);
      await page.getByRole('button', { name: 'Cancel run' }).click();
      await page.getByRole('button', { name: 'Cancel run' }).waitFor({ state: 'detached', timeout: 30_000 });
      expect(await page.getByRole('button', { name: 'Run all' }).isDisabled()).toBe(false);
    });
    expect(errors).toEqual([]);
  });
});
