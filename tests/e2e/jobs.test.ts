import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, SCREENSHOT_DIR } from '../helpers/browser';
import { startDashboardServer } from '../helpers/dashboard-server';

/** A 1 × 1 PNG (PNG specification, ISO/IEC 15948: signature, IHDR, IDAT, IEND), made by hand. */
const ONE_PIXEL_PNG = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAIAAACQd1PeAAAADElEQVR4nGM4k6YEAANWAVVytdGpAAAAAElFTkSuQmCC',
  'base64',
);

const shot = (page: Page, name: string) =>
  page.screenshot({ path: path.join(SCREENSHOT_DIR, name), fullPage: true });

describe('jobs in Chromium', () => {
  let dashboard: Awaited<ReturnType<typeof startDashboardServer>>;
  let browser: Browser;
  let page: Page;
  beforeAll(async () => {
    dashboard = await startDashboardServer();
    browser = await launchBrowser();
    page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    page.setDefaultTimeout(8_000);
    await page.goto(dashboard.url);
    await page.getByLabel('E-mail').fill('owner@ridgeback.test');
    await page.getByLabel('Password').fill('vanbay-demo-2026');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('navigation', { name: 'Sections' }).waitFor();
  });
  afterAll(async () => {
    await browser?.close();
    await dashboard?.close();
  });

  it('filters the jobs table by status and search', async () => {
    await page.goto(`${dashboard.url}/jobs`);
    const table = page.getByRole('table');
    await table
      .getByRole('link', { name: /^#\d+$/ })
      .first()
      .waitFor();
    await shot(page, 'jobs.png');

    await page.getByLabel('Status').selectOption('paid');
    await page.waitForURL(/status=paid/);
    // The address changes a moment before the table swaps to the filtered query, so the old rows (or
    // the loading line) can still be on screen: wait until the rows shown are the filtered ones.
    await expect
      .poll(async () => {
        await page.getByText(/All \d+ jobs? shown|jobs? loaded/).waitFor();
        const statuses = await table.locator('tbody tr td:nth-child(2)').allInnerTexts();
        return [...new Set(statuses.map((s) => s.replace(/[^a-z ]/g, '').trim()))];
      })
      .toEqual(['paid']);
  });

  it('books a job, adds a reading, edits a line with the totals following, and uploads a photo', async () => {
    await page.goto(`${dashboard.url}/jobs`);
    await page
      .getByRole('table')
      .getByRole('link', { name: /^#\d+$/ })
      .first()
      .waitFor();
    // The keyboard shortcut for a new job (the ? list names it).
    await page.keyboard.press('n');
    await page.getByRole('heading', { name: 'New job' }).waitFor();
    await page.getByLabel('Find the customer').fill('Jules');
    const customer = page.getByLabel('Customer', { exact: true });
    await customer.locator('option', { hasText: 'Jules Marchetti' }).waitFor({ state: 'attached' });
    await customer.selectOption({ label: 'Jules Marchetti' });
    const machine = page.getByLabel('Machine', { exact: true });
    await machine.locator('option').nth(1).waitFor({ state: 'attached' });
    await machine.selectOption({ index: 1 });
    await page.getByLabel(/^Complaint/).fill('Bogs down climbing the fire road, fine on the flat.');
    await page.getByRole('button', { name: 'Book the job' }).click();
    await page.getByRole('heading', { level: 1, name: /^Job #\d+ · / }).waitFor();
    expect(page.url()).toMatch(/\/jobs\/\d+$/);

    // 43 psi × 6.894757 kPa/psi (NIST SP 811, B.8) = 296.47 kPa.
    await page.getByLabel(/^Reading/).fill('43psi');
    await page.getByText('Stored as 296.47 kPa').waitFor();
    await page.getByRole('button', { name: 'Add reading' }).click();
    await page.getByText(/^Saved 43 psi/).waitFor();
    expect(await page.getByRole('table').first().innerText()).toContain('43 psi');

    await page.getByLabel('Description').fill('Fuel system diagnosis');
    await page.getByLabel('Quantity', { exact: true }).fill('1.5');
    await page.getByLabel('Unit price ($)').fill('95');
    await page.getByRole('button', { name: 'Add line' }).click();
    const quantity = page.getByLabel('Quantity of Fuel system diagnosis');
    await quantity.waitFor();
    // Labour is not taxed (the seed's rule): 1.5 h × $95.00 = $142.50, then 2 h = $190.00, by hand.
    await expect.poll(() => page.getByTestId('subtotal').innerText()).toBe('$142.50');
    await quantity.fill('2');
    await expect.poll(() => page.getByTestId('subtotal').innerText()).toBe('$190.00');
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.getByRole('button', { name: 'Save', exact: true }).waitFor({ state: 'detached' });
    await page.reload();
    await expect.poll(() => page.getByTestId('subtotal').innerText()).toBe('$190.00');

    await page.getByLabel('Caption (optional)').fill('Gauge at key-on');
    await page
      .getByLabel('File')
      .setInputFiles({ name: 'gauge.png', mimeType: 'image/png', buffer: ONE_PIXEL_PNG });
    await page.getByText('Uploaded gauge.png.').waitFor();
    const thumbnail = page.getByRole('img', { name: 'Gauge at key-on' });
    await thumbnail.waitFor();
    // The thumbnail is the stored file itself, served back under the same sign-in.
    expect(await thumbnail.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(1);
    await shot(page, 'job.png');
  });

  it('refuses a file over the size limit before uploading it', async () => {
    await page.getByLabel('File').setInputFiles({
      name: 'video.png',
      mimeType: 'image/png',
      buffer: Buffer.alloc(10 * 1024 * 1024 + 1),
    });
    await page.getByText(/video\.png is 10(\.0)? MB: the limit is 10 MB\./).waitFor();
  });
});
