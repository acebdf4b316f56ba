import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Locator, Page } from 'playwright-core';
import { launchBrowser, signUp, uniqueEmail, watchPageErrors, withFailureShot } from './browser';

/** Replaces the text of a CodeMirror expression field, typing as a person would. */
async function typeExpression(field: Locator, text: string): Promise<void> {
  await field.click();
  await field.press('Control+A');
  await field.press('Backspace');
  await field.pressSequentially(text);
}

async function addCell(page: Page, item: string): Promise<void> {
  await page.getByRole('button', { name: 'Add cell', exact: true }).click();
  await page.getByRole('menuitem', { name: item }).click();
}

describe('building a sheet in the browser', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('builds a sheet from an empty one, runs it, marks stale cells, reruns, saves and finds it all after reload', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const errors = watchPageErrors(page);
    await withFailureShot(page, 'sheet-editor', async () => {
      await signUp(page, {
        email: uniqueEmail('hydrologist'),
        name: 'Pavel Ndiaye',
        password: 'meander-e2e-password',
      });
      await page.getByRole('button', { name: 'New sheet' }).click();
      await page.getByLabel('Title').fill('Pond level anomaly');
      await page.getByRole('button', { name: 'Create' }).click();
      await page.waitForURL(/\/sheets\/[^/?]+/);

      await addCell(page, 'Parameters');
      const value = page.getByRole('textbox', { name: 'value of parameter 1 (k)' });
      await value.fill('0.7');

      await addCell(page, 'Model');
      await typeExpression(page.getByRole('textbox', { name: /^Drift of/ }).first(), '-k * x');

      await addCell(page, 'Simulation');
      const paths = page
        .getByRole('textbox', { name: 'Paths' })
        .or(page.getByRole('spinbutton', { name: 'Paths' }))
        .first();
      await paths.fill('3000');
      await paths.press('Tab');

      await addCell(page, 'Chart');
      // naive-ui draws its own radio and keeps the native input visually hidden.
      await page.getByText('Sample paths', { exact: true }).click();
      const shown = page
        .getByRole('textbox', { name: 'Paths shown' })
        .or(page.getByRole('spinbutton', { name: 'Paths shown' }))
        .first();
      await shown.fill('12');
      await shown.press('Tab');

      await addCell(page, 'Probe');

      // Nothing is wrong with the sheet before it runs.
      await expect(page.getByText(/problems?$/).count()).resolves.toBe(0);

      await page.getByRole('button', { name: 'Run all' }).click();
      const chart = page.getByRole('img', { name: /^Sample paths of x: 12 paths/ });
      await chart.waitFor({ timeout: 90_000 });
      const probe = page.getByRole('status', { name: 'Probe result' });
      await probe.waitFor();
      const probeText = await probe.innerText();
      expect(probeText).toMatch(/±/);
      expect(probeText).toMatch(/95 % interval \[[−0-9.e-]+, [−0-9.e-]+\]/);
      expect(probeText).toMatch(/from 3,000 paths/);

      // A parameter change makes everything downstream stale, and a rerun clears it.
      await expect(page.getByText('stale: inputs changed').count()).resolves.toBe(0);
      await value.fill('1.4');
      await value.press('Tab');
      await page.getByText('stale: inputs changed').first().waitFor();
      expect(await page.getByText('stale: inputs changed').count()).toBeGreaterThanOrEqual(3);
      await page.getByRole('button', { name: 'Run all' }).click();
      await page.getByRole('button', { name: 'Cancel run' }).waitFor({ state: 'detached', timeout: 90_000 });
      await expect.poll(() => page.getByText('stale: inputs changed').count(), { timeout: 30_000 }).toBe(0);

      await page.getByRole('button', { name: 'Save version' }).click();
      await page.getByRole('textbox', { name: 'Message' }).fill('first pond model');
      await page.getByRole('button', { name: 'Save', exact: true }).click();
      await page.getByLabel('Version 2').waitFor();

      await page.reload();
      await page.getByLabel('Version 2').waitFor();
      // The sheet opens as it reads: parameters as a table, the model typeset; editors on demand.
      await page.getByRole('table').getByRole('cell', { name: '1.4', exact: true }).waitFor();
      await page.getByRole('button', { name: 'Edit parameters cell' }).click();
      expect(await page.getByRole('textbox', { name: 'value of parameter 1 (k)' }).inputValue()).toBe('1.4');
      await page.getByRole('button', { name: 'Edit model cell' }).click();
      await page.getByText('-k * x').first().waitFor();
    });
    expect(errors).toEqual([]);
    await context.close();
  });
});
