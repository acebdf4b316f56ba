import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import AxeBuilder from '@axe-core/playwright';
import type { Browser, Page } from 'playwright-core';
import { findExampleSheet } from '@shared/examples/index';
import { scaleSheetPaths } from '@shared/run/scale';
import {
  appUrl,
  launchBrowser,
  signIn,
  signUp,
  uniqueEmail,
  watchPageErrors,
  withFailureShot,
} from './browser';

/**
 * The axe-core audit of every page and dialog: no serious or critical violation of WCAG 2.1 A and
 * AA rules, and exactly one main landmark per page.
 */
async function audit(page: Page, where: string): Promise<void> {
  const results = await new AxeBuilder({ page })
    .withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'best-practice'])
    .analyze();
  const grave = results.violations
    .filter((violation) => violation.impact === 'serious' || violation.impact === 'critical')
    .map((violation) => ({
      rule: violation.id,
      impact: violation.impact,
      help: violation.help,
      targets: violation.nodes.slice(0, 5).map((node) => node.target.join(' ')),
    }));
  expect(grave, `${where}: ${JSON.stringify(grave, null, 1)}`).toEqual([]);
  expect(await page.getByRole('main').count(), `${where}: main landmarks`).toBe(1);
}

const SHOTS = new URL('./screenshots/', import.meta.url);

describe('accessibility of every page', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('finds no serious or critical problem on the pages a visitor sees before signing in', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await withFailureShot(page, 'axe-visitor', async () => {
      for (const path of ['/sign-in', '/sign-up', '/forgot-password']) {
        await page.goto(appUrl(path));
        await page.getByRole('main').waitFor();
        await page.waitForLoadState('networkidle');
        await audit(page, path);
      }
    });
    await context.close();
  });

  it('finds none on the sheet list, a sheet of every cell kind and its dialogs, and the account page', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const errors = watchPageErrors(page);
    await withFailureShot(page, 'axe-member', async () => {
      await signUp(page, {
        email: uniqueEmail('axe'),
        name: 'Odile Varga',
        password: 'meander-e2e-password',
      });
      await page.waitForURL(/\/sheets/);
      const soil = scaleSheetPaths(findExampleSheet('soil-moisture-anomaly')!.document, 0.1);
      // The sweep and scenarios kinds too, small (their cards show tables and charts once run).
      const doc = {
        ...soil,
        cells: [
          ...soil.cells,
          {
            id: 'tau-sweep',
            kind: 'sweep' as const,
            probe: 'drought-odds',
            axes: [{ parameter: 'tau', spacing: 'linear' as const, from: 12, to: 36, count: 3, values: [] }],
            independent: false,
            paths: 500,
            target: { value: 0.1, refineRuns: 1 },
          },
          {
            id: 'season-plans',
            kind: 'scenarios' as const,
            simulation: 'season-run',
            probes: ['drought-odds'],
            scenarios: [
              { name: 'usual', overrides: {} },
              { name: 'noisier', overrides: { s: 12 } },
            ],
            baseline: 'usual',
            independent: false,
            paths: 500,
          },
        ],
      };
      const response = await page.request.post(appUrl('/api/sheets'), {
        headers: { Origin: new URL(appUrl()).origin },
        data: { title: doc.title, document: doc },
      });
      expect(response.status()).toBe(201);
      const { id } = (await response.json()) as { id: string };

      await page.goto(appUrl('/sheets'));
      await page.getByRole('link', { name: doc.title }).first().waitFor();
      await audit(page, 'sheet list');

      await page.goto(appUrl(`/sheets/${id}`));
      await page.getByRole('button', { name: 'Run all' }).click();
      await page.getByRole('button', { name: 'Cancel run' }).waitFor({ state: 'detached', timeout: 90_000 });
      await page.locator('.summary-line code.digest').first().waitFor();
      await page.locator('.katex').first().waitFor();
      await page.locator('.js-plotly-plot').first().waitFor({ timeout: 60_000 });
      await page.waitForTimeout(500);
      await audit(page, 'sheet in reading view');

      // Plotly's own toolbar and its links off the site never appear.
      expect(await page.locator('.js-plotly-plot').count()).toBeGreaterThan(0);
      expect(await page.locator('.modebar-btn, .modebar-group').count()).toBe(0);
      expect(await page.locator('a[href*="plot.ly"], a[href*="chart-studio"]').count()).toBe(0);
      // For the README: the model typeset, the simulation's line, a chart with its toolbar.
      await page.evaluate(() => document.querySelector('[data-cell-id="soil-model"]')?.scrollIntoView());
      await page.screenshot({ path: new URL('sheet-reading-view.png', SHOTS).pathname, fullPage: false });
      const toolbar = page.getByRole('toolbar').first();
      await toolbar.scrollIntoViewIfNeeded();
      await toolbar
        .locator('xpath=ancestor::article[1]')
        .screenshot({ path: '/tmp/meander-e2e-chart-toolbar.png' });

      for (const kind of [
        'note',
        'parameters',
        'model',
        'simulation',
        'chart',
        'probe',
        'step-size study',
        'scenarios',
        'sweep',
      ])
        await page
          .getByRole('button', { name: `Edit ${kind} cell`, exact: true })
          .first()
          .click();
      await page
        .getByRole('textbox', { name: /^Drift of/ })
        .first()
        .waitFor();
      await audit(page, 'sheet with every editor open');

      await page.getByRole('button', { name: 'Add cell', exact: true }).click();
      await page.getByRole('menuitem').first().waitFor();
      await audit(page, 'add cell menu');
      await page.keyboard.press('Escape');

      await page.getByRole('button', { name: 'Keyboard shortcuts' }).click();
      await page.getByRole('dialog').waitFor();
      await audit(page, 'keyboard shortcuts');
      await page.keyboard.press('Escape');
      await page.getByRole('dialog').waitFor({ state: 'detached' });

      await page.getByRole('button', { name: 'Save version' }).click();
      await page.getByRole('dialog').waitFor();
      await audit(page, 'save version dialog');
      await page.keyboard.press('Escape');

      await page.goto(appUrl('/account'));
      await page.getByRole('main').waitFor();
      await page.waitForLoadState('networkidle');
      await audit(page, 'account');
    });
    expect(errors).toEqual([]);
    await context.close();
  });

  it('finds none on the admin page', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await withFailureShot(page, 'axe-admin', async () => {
      await signIn(page, { email: 'admin@example.test', password: 'meander-admin-demo' });
      await page.waitForURL(/\/sheets/);
      await page.goto(appUrl('/admin'));
      await page.getByRole('table').first().waitFor();
      await audit(page, 'admin');
    });
    await context.close();
  });
});
