import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import {
  appUrl,
  confirmationLink,
  launchBrowser,
  signIn,
  uniqueEmail,
  watchPageErrors,
  withFailureShot,
} from './browser';

/**
 * Working together, in three browser contexts: the owner (a demo member), a new person invited by
 * e-mail, and the site admin, who reads the development mailbox (closed to others on servers
 * that restrict it to admins; open or not, the admin can read it).
 */
const OWNER = { email: 'maren.lindqvist@example.test', password: 'meander-member-demo' };
const ADMIN = { email: 'admin@example.test', password: 'meander-admin-demo' };
const SHEET = 'Harvested fish stock: extinction risk under environmental noise';
const SHOTS = 'tests/e2e/screenshots';

async function runAll(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Run all' }).click();
  await page.getByRole('button', { name: 'Cancel run' }).waitFor();
  await page.getByRole('button', { name: 'Cancel run' }).waitFor({ state: 'detached', timeout: 110_000 });
}

async function openChartComments(page: Page): Promise<void> {
  await page
    .getByRole('button', { name: /^Comments on chart cell/ })
    .first()
    .click();
  await page.getByRole('complementary', { name: /^Comments on chart cell/ }).waitFor();
}

describe('owner, invitee and admin in Chromium', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('invites by mail, comments on a chart, forks, compares with the source and reruns an old version', async () => {
    const owner = await (await browser.newContext({ viewport: { width: 1280, height: 900 } })).newPage();
    const invitee = await (await browser.newContext({ viewport: { width: 1280, height: 900 } })).newPage();
    const admin = await (await browser.newContext()).newPage();
    const ownerErrors = watchPageErrors(owner);
    const inviteeErrors = watchPageErrors(invitee);
    const person = {
      email: uniqueEmail('estuary-modeller'),
      name: 'Saoirse Ndlovu',
      password: 'meander-e2e-password',
    };

    await withFailureShot(owner, 'collaboration-owner', async () => {
      await signIn(owner, OWNER);
      await owner.getByRole('list', { name: 'Your sheets' }).getByRole('link', { name: SHEET }).click();
      await owner.getByRole('button', { name: 'Run all' }).waitFor();
      const sheetUrl = owner.url();
      await runAll(owner);
      await owner.getByRole('button', { name: 'Save version' }).click();
      await owner.getByRole('textbox', { name: 'Message' }).fill('baseline run with digests');
      await owner.getByRole('button', { name: 'Save', exact: true }).click();
      await owner.getByLabel('Version 2').waitFor();

      await owner.getByRole('button', { name: 'Share', exact: true }).click();
      await owner.getByRole('textbox', { name: 'E-mail address' }).fill(person.email);
      await owner.getByRole('button', { name: 'Invite' }).click();
      await owner.getByText(`Invited ${person.email} by e-mail as commenter.`).waitFor();
      await owner.getByRole('list', { name: 'Pending invitations' }).getByText(person.email).waitFor();
      await owner.screenshot({ path: `${SHOTS}/sharing-dialog.png` });
      await owner.keyboard.press('Escape');

      // The admin reads the invitation in the development mailbox.
      await signIn(admin, ADMIN);
      await admin.waitForURL(/\/sheets/);
      await admin.goto(appUrl('/mailbox'));
      const mail = admin
        .getByRole('article')
        .filter({ hasText: `To: ${person.email}` })
        .first();
      await mail.waitFor();
      const link = /\/invitations\/[A-Za-z0-9_-]+/.exec((await mail.textContent()) ?? '')?.[0];
      expect(link).toBeDefined();

      await withFailureShot(invitee, 'collaboration-invitee', async () => {
        await invitee.goto(appUrl(link!));
        await invitee.getByText(/invites .* as commenter/).waitFor();
        await invitee.getByRole('link', { name: 'Sign up to accept' }).click();
        await invitee.getByLabel('Email').fill(person.email);
        await invitee.getByLabel('Display name').fill(person.name);
        await invitee.getByLabel('Password', { exact: true }).fill(person.password);
        await invitee.getByRole('button', { name: 'Sign up' }).last().click();
        // Sign-up is confirmed through a mailed link (read as the site admin), then the invitee
        // comes back to the invitation signed in.
        await invitee.getByText('Check your mail').waitFor();
        await invitee.goto(await confirmationLink(person.email));
        await invitee.waitForURL(/\/sheets$/);
        await invitee.goto(appUrl(link!));
        await invitee.getByRole('button', { name: 'Accept and open the sheet' }).click();
        await invitee.waitForURL(/\/sheets\/[^/?]+$/);
        await invitee.goto(appUrl('/sheets'));
        const shared = invitee.getByRole('list', { name: 'Sheets shared with you' });
        await shared.getByText('you are commenter').waitFor();
        await shared.getByRole('link', { name: SHEET }).click();
        await invitee.getByRole('button', { name: 'Run all' }).waitFor();
        expect(await invitee.getByRole('button', { name: 'Save version' }).count()).toBe(0);

        await openChartComments(invitee);
        await invitee
          .getByRole('textbox', { name: 'New comment' })
          .fill('Does the fan include the **absorbed** paths?');
        await invitee.getByRole('button', { name: 'Comment', exact: true }).click();
        await invitee.getByRole('listitem', { name: `Thread by ${person.name}` }).waitFor();
        await invitee
          .getByRole('complementary', { name: /^Comments on chart cell/ })
          .screenshot({ path: `${SHOTS}/comment-thread-chart.png` });
      });

      await owner.reload();
      await openChartComments(owner);
      const thread = owner.getByRole('listitem', { name: `Thread by ${person.name}` });
      await thread.getByRole('button', { name: 'Resolve thread' }).click();
      await thread.getByText('Resolved').waitFor();

      await owner.getByRole('button', { name: 'Share', exact: true }).click();
      // naive-ui's menu options carry no role: choose with the keyboard, as a person can.
      await owner.getByLabel(`Role of ${person.name}`).click();
      // Keys pressed before the menu is open go nowhere: wait for it.
      await owner.locator('.n-base-select-menu').waitFor();
      await owner.keyboard.press('ArrowDown');
      await owner.keyboard.press('Enter');
      await expect
        .poll(() => owner.getByRole('row').filter({ hasText: person.email }).textContent())
        .toContain('editor');
      await owner.keyboard.press('Escape');

      await withFailureShot(invitee, 'collaboration-fork', async () => {
        await invitee.reload();
        await invitee.getByRole('button', { name: 'Save version' }).waitFor();
        await invitee.getByRole('button', { name: 'Fork', exact: true }).click();
        await invitee.waitForURL(
          (url) => url.toString() !== sheetUrl && /\/sheets\/[^/?]+$/.test(url.pathname),
        );
        await invitee.getByText(/forked from/).waitFor();
        // Cards open in their reading view: open the parameters' editor first.
        await invitee.getByRole('button', { name: 'Edit parameters cell' }).click();
        const sigma = invitee.getByRole('textbox', { name: /value of parameter \d+ \(sigma\)/ });
        await sigma.fill('0.55');
        await sigma.press('Tab');
        await runAll(invitee);
        await invitee.getByRole('button', { name: 'Compare with source' }).click();
        const diff = invitee.getByRole('dialog');
        await diff.getByText('σ: 0.40 → 0.55').waitFor();
        await diff.screenshot({ path: `${SHOTS}/fork-diff.png` });
      });

      // A later version, so that version 2 is an old one.
      await owner.goto(sheetUrl);
      await owner.getByRole('textbox', { name: 'Sheet title' }).fill(`${SHEET} (reviewed)`);
      await owner.getByRole('button', { name: 'Save version' }).click();
      await owner.getByRole('textbox', { name: 'Message' }).fill('title after review');
      await owner.getByRole('button', { name: 'Save', exact: true }).click();
      await owner.getByLabel('Version 3').waitFor();
      await owner.getByRole('button', { name: 'Versions' }).click();
      await owner.getByRole('button', { name: 'Rerun and compare version 2' }).click();
      const report = owner.getByRole('region', { name: 'Rerun and compare' });
      await report.getByText('stock-run reproduced bit for bit').waitFor({ timeout: 110_000 });
      await owner.getByRole('dialog').screenshot({ path: `${SHOTS}/rerun-and-compare.png` });
    });
    expect([...ownerErrors, ...inviteeErrors]).toEqual([]);
  });
});
