import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { appUrl, launchBrowser, signUp, uniqueEmail, withFailureShot } from './browser';

const PASSWORD = 'meander-e2e-password';

/**
 * An invented Cox–Ingersoll–Ross interest-rate sheet whose parameters break the Feller condition
 * (2κθ = 0.036 < σ² = 0.2025): Euler–Maruyama drives many paths below zero, where the square root
 * of the diffusion is not a number, so more than 1 % of them are lost.
 */
function fellerBreakingSheet() {
  return {
    schemaVersion: 1,
    title: 'Short rate near zero',
    cells: [
      {
        id: 'params-rate',
        kind: 'params',
        params: [
          { name: 'kappa', value: 0.9 },
          { name: 'theta', value: 0.02 },
          { name: 'sigma', value: 0.45 },
        ],
      },
      {
        id: 'model-rate',
        kind: 'model',
        name: 'Short rate',
        states: [
          { name: 'r', initial: '0.02', drift: 'kappa * (theta - r)', diffusion: { W: 'sigma * sqrt(r)' } },
        ],
        noises: [{ name: 'W' }],
        calculus: 'ito',
      },
      {
        id: 'simulation-rate',
        kind: 'simulation',
        name: 'Three years',
        model: 'model-rate',
        method: 'euler-maruyama',
        t0: 0,
        t1: 3,
        steps: 300,
        paths: 2000,
        seed: 4411,
        saveCount: 31,
        samplePaths: 5,
        boundaries: {},
        overrides: {},
      },
    ],
  };
}

async function createSheet(page: Page, body: unknown): Promise<string> {
  const response = await page.request.post(appUrl('/api/sheets'), {
    data: body,
    headers: { Origin: new URL(appUrl()).origin },
  });
  expect(response.status()).toBe(201);
  return ((await response.json()) as { id: string }).id;
}

describe('the page does not hide a wrong number or lose a result', () => {
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let sheetId: string;

  beforeAll(async () => {
    browser = await launchBrowser();
    context = await browser.newContext();
    page = await context.newPage();
    await signUp(page, { email: uniqueEmail('honest'), name: 'Tomas Ferreira', password: PASSWORD });
    await page.waitForURL(/\/sheets/);
    sheetId = await createSheet(page, { title: 'Short rate near zero', document: fellerBreakingSheet() });
  });
  afterAll(async () => {
    await context?.close().catch(() => undefined);
    await browser?.close();
  });

  it('says a Feller-violating CIR run is conditional on its surviving paths', async () => {
    await withFailureShot(page, 'honest-feller', async () => {
      await page.goto(appUrl(`/sheets/${sheetId}`));
      await page.getByLabel('Version 1').waitFor();
      await page.getByRole('button', { name: 'Run all' }).click();
      // The summary table is part of the simulation's editor; cards open in their reading view.
      await page.getByRole('button', { name: 'Edit simulation cell' }).click();
      const summary = page.getByRole('region', { name: 'Simulation summary' });
      await summary.waitFor({ timeout: 60_000 });
      await summary
        .getByText(/conditional on the [\d,]+ surviving paths/)
        .first()
        .waitFor();
      await summary
        .getByText(/were lost/)
        .first()
        .waitFor();
    });
  });

  it('refuses to run an invalid model, says why, and keeps the previous results', async () => {
    await withFailureShot(page, 'honest-invalid', async () => {
      await page.getByRole('button', { name: 'Edit model cell' }).click();
      const drift = page.getByRole('textbox', { name: /^Drift of r/ }).first();
      await drift.click();
      await drift.press('Control+A');
      await drift.press('Backspace');
      await drift.pressSequentially('kappa * (theta - r) + nosuch');
      const reason = page.locator('#run-blocked-reason');
      await reason.waitFor();
      expect(await reason.textContent()).toMatch(/Model 'Short rate', drift of r:/);
      expect(await page.getByRole('button', { name: 'Run all' }).isDisabled()).toBe(true);
      const summary = page.getByRole('region', { name: 'Simulation summary' });
      expect(await summary.isVisible()).toBe(true);
    });
  });

  it('offers a draft older than the newest version instead of imposing it', async () => {
    await withFailureShot(page, 'honest-draft', async () => {
      // The page holds a draft based on version 1 (the edited drift); someone saves version 2.
      const response = await page.request.post(appUrl(`/api/sheets/${sheetId}/versions`), {
        data: {
          baseVersion: 1,
          message: 'longer horizon',
          document: { ...fellerBreakingSheet(), title: 'Short rate, v2' },
        },
        headers: { Origin: new URL(appUrl()).origin },
      });
      expect(response.status()).toBe(201);
      await page.reload();
      await page.getByText(/based on version 1, but the newest is version 2/).waitFor();
      expect(await page.getByRole('textbox', { name: 'Sheet title' }).inputValue()).toBe('Short rate, v2');
      await page.getByRole('button', { name: 'Compare with version 2' }).click();
      await page
        .getByRole('list', { name: 'Changes in your draft' })
        .getByText(/Model 'Short rate'/)
        .waitFor();
    });
  });

  it('asks before running a stiff linear model at a step that is unstable for it', async () => {
    await withFailureShot(page, 'honest-stiff', async () => {
      // dX = -80 X dt + 0.2 dW over 2 time units in 20 steps: h = 0.1, hλ = -8, |1 + hλ| = 7 > 1,
      // unstable for Euler–Maruyama (stable only for h < 2/80 = 0.025; Higham 2000, §2).
      const stiff = {
        schemaVersion: 1,
        title: 'Stiff relaxation',
        cells: [
          { id: 'params-stiff', kind: 'params', params: [{ name: 'rate', value: 80 }] },
          {
            id: 'model-stiff',
            kind: 'model',
            name: 'Fast relaxation',
            states: [{ name: 'x', initial: '1', drift: '-rate * x', diffusion: { W: '0.2' } }],
            noises: [{ name: 'W' }],
            calculus: 'ito',
          },
          {
            id: 'simulation-stiff',
            kind: 'simulation',
            name: 'Coarse step',
            model: 'model-stiff',
            method: 'euler-maruyama',
            t0: 0,
            t1: 2,
            steps: 20,
            paths: 500,
            seed: 5120,
            saveCount: 11,
            samplePaths: 5,
            boundaries: {},
            overrides: {},
          },
        ],
      };
      const stiffId = await createSheet(page, { title: 'Stiff relaxation', document: stiff });
      await page.goto(appUrl(`/sheets/${stiffId}`));
      await page.getByLabel('Version 1').waitFor();
      await page.getByRole('button', { name: 'Run all' }).click();
      await page.getByText('The step is too large for this model').waitFor({ timeout: 60_000 });
      await page.getByText(/A step below 0\.025\d* is stable here/).waitFor();
      await page.getByRole('button', { name: 'Do not run' }).click();
      expect(await page.locator('article[data-cell-id="simulation-stiff"]').textContent()).toContain(
        'not run yet',
      );
    });
  });
});
