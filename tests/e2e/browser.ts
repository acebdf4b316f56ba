import { chromium, type Browser, type Page } from 'playwright-core';
import { inject } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/seed';

/** Debian's Chromium, headless, with the flags this machine needs (no background network, no GPU). */
export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

export function appUrl(path = '/'): string {
  return new URL(path, inject('appUrl')).toString();
}

/** A fresh e-mail per test run, so tests never collide with the seeded demo accounts. */
export function uniqueEmail(label: string): string {
  return `${label}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}@example.test`;
}

/** Collects page errors and failed console messages, so a test can assert there were none. */
export function watchPageErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('pageerror', (error) => errors.push(error.message));
  page.on('console', (message) => {
    // A 401 from /api/auth/me before sign-in is expected; the browser logs every non-2xx response.
    if (message.type() === 'error' && !message.text().startsWith('Failed to load resource'))
      errors.push(message.text());
  });
  return errors;
}

export async function signUp(
  page: Page,
  user: { email: string; name: string; password: string },
): Promise<void> {
  await page.goto(appUrl('/sign-in'));
  await page
    .getByRole('tab', { name: 'Sign up' })
    .or(page.getByRole('button', { name: 'Sign up' }))
    .first()
    .click();
  await page.getByLabel('Email').fill(user.email);
  await page.getByLabel('Display name').fill(user.name);
  await page.getByLabel('Password', { exact: true }).fill(user.password);
  await page.getByRole('button', { name: 'Sign up' }).last().click();
  await page.getByText('Check your mail').waitFor();
  // The account comes from the mailed link, read here as the site admin reads the mailbox.
  await page.goto(await confirmationLink(user.email));
  await page.waitForURL(/\/sheets$/);
}

const SITE_ADMIN = DEMO_ACCOUNTS.find((account) => account.role === 'admin')!;

/** The newest sign-up link mailed to `email`, from the development mailbox (as the site admin). */
export async function confirmationLink(email: string): Promise<string> {
  const origin = new URL(appUrl()).origin;
  const signIn = await fetch(appUrl('/api/auth/sign-in'), {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: origin },
    body: JSON.stringify(SITE_ADMIN),
  });
  if (!signIn.ok) throw new Error(`the site admin could not sign in: ${signIn.status}`);
  const cookie = signIn.headers.get('set-cookie')!.split(';')[0]!;
  for (let waited = 0; waited < 10_000; waited += 100) {
    const mailbox = (await (
      await fetch(appUrl('/api/dev/mailbox'), { headers: { Cookie: cookie } })
    ).json()) as {
      messages: { to: string[]; subject: string; text: string }[];
    };
    const mail = mailbox.messages.find(
      (message) => message.to.includes(email.toLowerCase()) && /Confirm your new/.test(message.subject),
    );
    const link = mail?.text.split(/\s+/).find((word) => word.includes('/confirm-sign-up?token='));
    if (link) return link;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error(`no sign-up link mailed to ${email}`);
}

export async function signIn(page: Page, user: { email: string; password: string }): Promise<void> {
  await page.goto(appUrl('/sign-in'));
  await page.getByLabel('Email').fill(user.email);
  await page.getByLabel('Password', { exact: true }).fill(user.password);
  await page.getByRole('button', { name: 'Sign in' }).last().click();
}

/** Runs a browser scenario; on failure keeps a screenshot in $E2E_SHOTS (default /tmp/meander-e2e) to look at. */
export async function withFailureShot<T>(page: Page, name: string, scenario: () => Promise<T>): Promise<T> {
  try {
    return await scenario();
  } catch (error) {
    const dir = process.env.E2E_SHOTS ?? '/tmp/meander-e2e';
    await page.screenshot({ path: `${dir}/${name}.png`, fullPage: true }).catch(() => undefined);
    throw error;
  }
}
