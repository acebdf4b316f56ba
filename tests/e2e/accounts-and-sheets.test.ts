import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import {
  appUrl,
  launchBrowser,
  signIn,
  signUp,
  uniqueEmail,
  watchPageErrors,
  withFailureShot,
} from './browser';

describe('a new user in Chromium', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('signs up, creates a sheet, sees it listed, signs out and back in and finds it again', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    const errors = watchPageErrors(page);
    const user = {
      email: uniqueEmail('river-ecologist'),
      name: 'Ines Okafor',
      password: 'meander-e2e-password',
    };

    await withFailureShot(page, 'accounts-and-sheets', async () => {
      await signUp(page, user);
      await page.getByRole('button', { name: 'New sheet' }).click();
      await page.getByLabel('Title').fill('Trout redd survival');
      await page.getByRole('button', { name: 'Create' }).click();
      // Creating a sheet opens it.
      await page.waitForURL(/\/sheets\/[^/]+/);
      const titleField = page.getByRole('textbox', { name: 'Sheet title' });
      await titleField.waitFor();
      expect(await titleField.inputValue()).toBe('Trout redd survival');

      await page.goto(appUrl('/sheets'));
      await page.getByText('Trout redd survival').first().waitFor();

      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(/\/sign-in/);
      await page.goto(appUrl('/sheets'));
      await page.waitForURL(/\/sign-in/);

      await signIn(page, user);
      await page.waitForURL(/\/sheets/);
      await page.getByText('Trout redd survival').first().waitFor();
    });
    expect(errors).toEqual([]);
    await context.close();
  });
});
