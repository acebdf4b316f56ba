import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { appUrl, launchBrowser, signUp, uniqueEmail, watchPageErrors, withFailureShot } from './browser';

/**
 * Observed data end to end in Chromium: a CSV with one bad row is refused in the preview with its
 * row and column, the fixed file uploads, its column is mapped to the model's state, the fan chart
 * shows the observations and the calibration read-out; the version goes out as a sheet file, comes
 * back in as a new sheet, and that sheet's report prints to a PDF.
 */
const demoFile = JSON.parse(
  readFileSync(
    new URL('../../shared/examples/sheet-files/pond-oxygen.meander.json', import.meta.url),
    'utf8',
  ),
) as { document: { title: string; cells: Record<string, unknown>[] } };

/** The demo's document without its dataset, and lighter to run. */
function documentWithoutData() {
  const doc = structuredClone(demoFile.document);
  doc.title = 'Upper mill pond';
  doc.cells = doc.cells.map((cell) => {
    if (cell.kind === 'data') return { ...cell, dataset: null, columns: [], groupColumn: undefined };
    if (cell.kind === 'simulation') return { ...cell, paths: 300, steps: 240 };
    return cell;
  });
  return doc;
}

const GOOD = ['day,deficit', '0,5.1', '2,3.9', '5,2.8', '9,2.1', '14,2.6', '20,2.2', '30,2.5'];
const BAD = [...GOOD.slice(0, 4), '9,n/a', ...GOOD.slice(5)];
const csvFile = (lines: string[]) => ({
  name: 'upper-pond.csv',
  mimeType: 'text/csv',
  buffer: Buffer.from(lines.join('\n') + '\n'),
});

describe('observed data, sheet files and the printable report', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('uploads a fixed CSV, overlays it on a fan chart, exports and imports the sheet, and prints its report', async () => {
    const context = await browser.newContext({
      viewport: { width: 1280, height: 900 },
      acceptDownloads: true,
    });
    const page = await context.newPage();
    const errors = watchPageErrors(page);
    await withFailureShot(page, 'data-files-report', async () => {
      await signUp(page, {
        email: uniqueEmail('limnologist'),
        name: 'Oona Brightwater',
        password: 'meander-e2e-password',
      });
      const origin = new URL(appUrl()).origin;
      const created = await page.request.post(appUrl('/api/sheets'), {
        headers: { Origin: origin },
        data: { title: 'Upper mill pond', document: documentWithoutData() },
      });
      expect(created.status()).toBe(201);
      const { id } = (await created.json()) as { id: string };
      await page.goto(appUrl(`/sheets/${id}`));

      await page.getByRole('button', { name: 'Edit data cell' }).click();
      const fileInput = page.getByLabel(/CSV or TSV file/);
      await fileInput.setInputFiles(csvFile(BAD));
      await expect
        .poll(() => page.getByRole('alert').filter({ hasText: 'Fix the file' }).innerText())
        .toMatch(/row 5, column deficit: 'n\/a' is not a number; leave the cell empty for a missing value/);
      expect(await page.getByRole('button', { name: /^Upload/ }).isDisabled()).toBe(true);

      await fileInput.setInputFiles(csvFile(GOOD));
      await page.getByRole('button', { name: 'Upload 7 rows' }).click();
      await page.getByLabel('State observed by column deficit').waitFor();
      await page.getByLabel('State observed by column deficit').selectOption('D');
      await page.getByLabel('Unit of column deficit').fill('mg/L');
      await page.getByLabel('Unit of column deficit').press('Tab');

      await page.getByRole('button', { name: 'Run all' }).click();
      const readout = page.getByRole('status').filter({ hasText: /^Calibration:/ });
      await readout.waitFor({ timeout: 60_000 });
      expect(await readout.innerText()).toMatch(
        /^Calibration: \d of 7 observed points \(\d+\.\d %\) lie inside the simulated 5–95 % band; 95 % Clopper–Pearson interval/,
      );
      expect(await page.getByText('diamonds: observed (upper-pond)').count()).toBeGreaterThan(0);

      await page.getByRole('button', { name: 'Save version' }).click();
      await page.getByLabel('Message').fill('Upper pond readings');
      await page.getByRole('button', { name: 'Save', exact: true }).click();
      await page.getByText('version 2').first().waitFor();

      const exported = await page.request.get(appUrl(`/api/sheets/${id}/versions/2/file`));
      expect(exported.status()).toBe(200);
      const sheetFile = Buffer.from(await exported.body());
      expect(JSON.parse(sheetFile.toString('utf8'))).toMatchObject({
        format: 'meander.sheet',
        datasets: [{ name: 'upper-pond' }],
      });

      await page.goto(appUrl('/sheets'));
      await page.getByLabel('Import a sheet file').setInputFiles({
        name: 'upper-mill-pond.meander.json',
        mimeType: 'application/json',
        buffer: sheetFile,
      });
      await page.waitForURL((url) => /\/sheets\/[^/]+$/.test(url.pathname) && !url.pathname.endsWith(id));
      const importedId = new URL(page.url()).pathname.split('/').at(-1)!;

      await page.goto(appUrl(`/sheets/${importedId}/versions/1/report`));
      await page.locator('[data-report-ready]').waitFor({ timeout: 60_000 });
      await page.getByText('Before you rely on these numbers').waitFor();
      await page
        .getByRole('status')
        .filter({ hasText: /^Calibration:/ })
        .waitFor();
      // The fit reads the uploaded series and shows its estimates with errors in the report.
      await page.getByText('Estimates (7 observations in 1 series)').waitFor();
      await page.emulateMedia({ media: 'print' });
      const pdf = await page.pdf({ format: 'A4', printBackground: false });
      const text = pdf.toString('latin1');
      expect(text.startsWith('%PDF-')).toBe(true);
      const pages = text.match(/\/Type\s*\/Page[^s]/g) ?? [];
      expect(pages.length).toBeGreaterThanOrEqual(1);
      // Text was set in fonts (not only pictures): the PDF embeds at least one font.
      expect(text).toMatch(/\/FontFile2|\/FontFile3|\/Font\b/);
    });
    expect(errors).toEqual([]);
    await context.close();
  });
});
