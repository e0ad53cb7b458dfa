import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, SCREENSHOT_DIR } from '../helpers/browser';
import { startDashboardServer } from '../helpers/dashboard-server';

/** Dollars as the dashboard writes them ("$1,234.56") to integer cents, by string arithmetic. */
function cents(text: string): number {
  const match = /^-?\$([\d,]+)\.(\d{2})$/.exec(text.trim());
  if (!match) throw new Error(`not an amount: ${text}`);
  return Number(match[1]!.replaceAll(',', '')) * 100 + Number(match[2]);
}

async function signIn(page: Page, url: string, email: string) {
  await page.goto(url);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill('vanbay-demo-2026');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('navigation', { name: 'Sections' }).waitFor();
}

const shot = (page: Page, name: string) =>
  page.screenshot({ path: path.join(SCREENSHOT_DIR, name), fullPage: true });

describe('the money pages in Chromium', () => {
  let dashboard: Awaited<ReturnType<typeof startDashboardServer>>;
  let browser: Browser;
  let page: Page;
  beforeAll(async () => {
    dashboard = await startDashboardServer();
    browser = await launchBrowser();
    page = await browser.newPage({ viewport: { width: 1280, height: 900 }, acceptDownloads: true });
    // A step that cannot happen fails on its own line well inside the test's time, naming what it waited for.
    page.setDefaultTimeout(8_000);
    await signIn(page, dashboard.url, 'owner@ridgeback.test');
  });
  afterAll(async () => {
    await browser?.close();
    await dashboard?.close();
  });

  it('lists invoices, opens one, downloads its PDF and takes a cash payment', async () => {
    await page.goto(`${dashboard.url}/invoices?show=unpaid`);
    const table = page.getByRole('table', { name: 'Invoices, newest first' });
    await table.waitFor();
    await shot(page, 'invoices.png');

    await table.getByRole('link').first().click();
    await page.getByRole('heading', { level: 1, name: /^Invoice \d{4}$/ }).waitFor();
    const balance = page.locator('dt', { hasText: /^Balance$/ }).locator('xpath=following-sibling::dd');
    const before = cents(await balance.innerText());
    expect(before).toBeGreaterThan(1000);

    const download = page.waitForEvent('download');
    await page.getByRole('link', { name: 'Download the PDF' }).click();
    const pdf = await readFile((await (await download).path())!);
    // ISO 32000-1 §7.5.2: a PDF file begins with the header "%PDF-".
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');

    const form = page.getByRole('form', { name: 'Record a payment' });
    await form.getByLabel('Cash').check();
    await form.getByLabel('Amount received ($)').fill('10.00');
    await form.getByRole('button', { name: 'Record the payment' }).click();
    await form.getByText(/\$10\.00 cash recorded\. Balance now/).waitFor();
    // 10.00 typed is 1 000 cents; the page's balance is the server's answer after the payment.
    await expect.poll(async () => cents(await balance.innerText())).toBe(before - 1000);
    await shot(page, 'invoice.png');
    await page.setViewportSize({ width: 390, height: 844 });
    await shot(page, 'invoice-phone.png');
    await page.setViewportSize({ width: 1280, height: 900 });
  });

  it('shows the mileage log and exports it as CSV', async () => {
    await page.goto(`${dashboard.url}/mileage?year=2026`);
    await page.getByRole('table', { name: 'Month by month, 2026' }).waitFor();
    await page.getByRole('table', { name: 'Trip log, 2026' }).waitFor();
    await shot(page, 'mileage-log.png');

    const download = page.waitForEvent('download');
    await page.getByRole('link', { name: 'Export 2026 as CSV' }).click();
    const csv = await readFile((await (await download).path())!, 'utf8');
    // The header of shared/api/trips.ts (TRIP_CSV_COLUMNS), records ending CRLF (RFC 4180).
    expect(csv.split('\r\n')[0]).toBe(
      'Date,Destination,Business purpose,Odometer start,Odometer end,Odometer unit,Miles,Rate (cents/mi),Deduction (USD)',
    );
    expect(csv.split('\r\n').filter((line) => line.startsWith('2026-')).length).toBeGreaterThan(0);
  });

  it('changes the labour rate, and the change is still there after a reload', async () => {
    await page.goto(`${dashboard.url}/settings`);
    const rates = page.getByRole('form', { name: 'Rates' });
    const rate = rates.getByLabel('Labour rate ($ per hour)');
    await rate.fill('102.50');
    await rates.getByRole('button', { name: 'Save rates' }).click();
    await rates.getByText(/^\W*Saved\.$/).waitFor();
    await shot(page, 'settings.png');
    await page.reload();
    await expect
      .poll(() =>
        page.getByRole('form', { name: 'Rates' }).getByLabel('Labour rate ($ per hour)').inputValue(),
      )
      .toBe('102.50');
  });

  it('lets the bookkeeper read invoices and mileage, but not settings or payments', async () => {
    const books = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    books.setDefaultTimeout(8_000);
    await signIn(books, dashboard.url, 'books@ridgeback.test');
    const nav = books.getByRole('navigation', { name: 'Sections' });
    await expect.poll(() => nav.getByRole('link', { name: 'Settings' }).count()).toBe(0);

    await nav.getByRole('link', { name: 'Invoices' }).click();
    const table = books.getByRole('table', { name: 'Invoices, newest first' });
    await table.getByRole('link').first().click();
    await books.getByRole('heading', { level: 1, name: /^Invoice \d{4}$/ }).waitFor();
    await books.getByRole('link', { name: 'Download the PDF' }).waitFor();
    expect(await books.getByRole('form', { name: 'Record a payment' }).count()).toBe(0);
    expect(await books.getByRole('button', { name: /send/i }).count()).toBe(0);

    await nav.getByRole('link', { name: 'Mileage' }).click();
    await books.getByRole('table', { name: /^Month by month/ }).waitFor();
    await books.goto(`${dashboard.url}/settings`);
    await books.getByRole('heading', { level: 1, name: 'Not open to your role' }).waitFor();
    await books.close();
  });
});
