import path from 'node:path';
import Decimal from 'decimal.js';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WeekReportSchema } from '../../shared/api/reports';
import { launchBrowser, SCREENSHOT_DIR } from '../helpers/browser';
import { startDashboardServer } from '../helpers/dashboard-server';

/** CONTRACT.md, "Demo sign-ins": one password for all. */
const DEMO_PASSWORD = 'vanbay-demo-2026';
/** The seeded data is built for 2026-11-18 (tests/helpers/fixtures.ts); its week starts Monday 11-16. */
const SEED_WEEK = '2026-11-16';

// ECMA-402 en-US dollars of the exact decimal decimal.js makes of cents ÷ 100: the expected text of
// an amount, worked out apart from the dashboard's own formatter.
const usd = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
const dollars = (cents: number) => usd.format(new Decimal(cents).div(100).toFixed(2) as unknown as number);

describe('signing in to the dashboard in Chromium', () => {
  let dashboard: Awaited<ReturnType<typeof startDashboardServer>>;
  let browser: Browser;
  let url: string;
  const contexts: BrowserContext[] = [];

  beforeAll(async () => {
    dashboard = await startDashboardServer();
    url = dashboard.url;
    browser = await launchBrowser();
  });
  afterAll(async () => {
    for (const context of contexts) await context.close();
    await browser?.close();
    await dashboard?.close();
  });

  /** A fresh browser profile (no cookie), so each person signs in from nothing. */
  async function freshPage(): Promise<{ page: Page; requested: string[] }> {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    contexts.push(context);
    const page = await context.newPage();
    const requested: string[] = [];
    page.on('request', (request) => requested.push(request.url()));
    return { page, requested };
  }

  async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill(password);
    await page.getByRole('button', { name: 'Sign in' }).click();
  }

  const navLabels = (page: Page) =>
    page.getByRole('navigation', { name: 'Sections' }).getByRole('link').allTextContents();

  /** The figure shown under a tile's label (its first <dd>). */
  const figure = (page: Page, label: string) =>
    page.locator('dt', { hasText: new RegExp(`^${label}$`) }).locator('xpath=following-sibling::dd[1]');

  it('takes the owner from a week link, through sign-in, to that week’s figures', async () => {
    const { page, requested } = await freshPage();
    await page.goto(`${url}/week?start=${SEED_WEEK}`);
    await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
    expect(new URL(page.url()).searchParams.get('next')).toBe(`/week?start=${SEED_WEEK}`);
    // The chart library is not part of what a signed-out visitor downloads.
    expect(requested.filter((address) => /revenue-bars/.test(address))).toEqual([]);

    await signIn(page, 'owner@ridgeback.test');
    await page.waitForURL(`${url}/week?start=${SEED_WEEK}`);
    await figure(page, 'Unpaid').waitFor();
    const banner = page.getByRole('banner');
    expect(await banner.getByText('Morgan Avery').count()).toBe(1);
    expect(await banner.getByText('Owner', { exact: true }).count()).toBe(1);
    expect(await navLabels(page)).toEqual([
      'Week',
      'Jobs',
      'Customers & machines',
      'Invoices',
      'Mileage',
      'Reminders',
      'Settings',
    ]);

    // What the page shows is the API's own answer for that week, amounts from its cents.
    const report = WeekReportSchema.parse(
      await (await page.request.get(`${url}/api/reports/week?start=${SEED_WEEK}`)).json(),
    );
    expect(report.unpaid.count).toBeGreaterThan(0);
    expect(await figure(page, 'Jobs done').textContent()).toBe(String(report.jobsDone));
    expect(await figure(page, 'Revenue').textContent()).toBe(dollars(report.revenueCents));
    expect(await figure(page, 'Collected').textContent()).toBe(dollars(report.collectedCents));
    expect(await figure(page, 'Unpaid').textContent()).toBe(dollars(report.unpaid.balanceCents));
    expect(await figure(page, 'Overdue').textContent()).toBe(dollars(report.overdue.balanceCents));
    expect(await figure(page, 'Deduction').textContent()).toBe(dollars(report.deductionCents!));
    // Miles to one decimal, as an odometer reads (hand rounding of the API's thousandths).
    expect(await figure(page, 'Miles').textContent()).toBe(`${new Decimal(report.miles).toFixed(1)} mi`);
    const dueRows = page
      .getByRole('heading', { name: 'Machines coming due' })
      .locator('xpath=..')
      .locator('tbody tr');
    expect(await dueRows.count()).toBe(report.machinesDue.length);
    expect(await dueRows.first().textContent()).toContain(report.machinesDue[0]!.machine);

    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, 'week-owner.png'), fullPage: true });
  });

  it('walks back a week with the picker and draws that week’s revenue by day', async () => {
    const { page, requested } = await freshPage();
    await page.goto(`${url}/sign-in?next=${encodeURIComponent(`/week?start=${SEED_WEEK}`)}`);
    await signIn(page, 'owner@ridgeback.test');
    await figure(page, 'Unpaid').waitFor();

    await page.getByRole('link', { name: /Previous week/ }).click();
    await page.waitForURL(`${url}/week?start=2026-11-09`);
    await page.locator('.recharts-bar-rectangle').first().waitFor();
    const report = WeekReportSchema.parse(
      await (await page.request.get(`${url}/api/reports/week?start=2026-11-09`)).json(),
    );
    const daysWithRevenue = report.revenueByDay.filter((day) => day.cents > 0).length;
    expect(daysWithRevenue).toBeGreaterThan(0);
    expect(await page.locator('.recharts-bar-rectangle path').count()).toBe(daysWithRevenue);
    expect(await figure(page, 'Revenue').textContent()).toBe(dollars(report.revenueCents));
    // The chart's code arrives only now, with a week that has something to draw.
    expect(requested.some((address) => /revenue-bars-.*\.js$/.test(address))).toBe(true);

    await page.evaluate(() => document.fonts.ready);
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, 'week-owner-chart.png'), fullPage: true });

    // The phone on the van's hotspot, and the night palette: the same page must hold up in both.
    await page.setViewportSize({ width: 390, height: 844 });
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, 'week-owner-phone.png'), fullPage: true });
    await page.setViewportSize({ width: 1280, height: 900 });
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, 'week-owner-night.png'), fullPage: true });
  });

  it('shows the helper no Week and no Invoices, and starts them on Jobs', async () => {
    const { page } = await freshPage();
    await page.goto(url);
    await signIn(page, 'helper@ridgeback.test');
    await page.waitForURL(`${url}/jobs`);
    await page.getByRole('heading', { level: 1, name: 'Jobs' }).waitFor();

    expect(await navLabels(page)).toEqual(['Jobs', 'Customers & machines', 'Mileage', 'Reminders']);
    await page.goto(`${url}/week?start=${SEED_WEEK}`);
    await page.getByRole('heading', { level: 1, name: 'Not open to your role' }).waitFor();
    expect(await page.getByText('Unpaid', { exact: true }).count()).toBe(0);
  });

  it('shows a customer only their own sections', async () => {
    const { page } = await freshPage();
    await page.goto(url);
    await signIn(page, 'jules@example.test');
    await page.getByRole('heading', { level: 1, name: 'Your jobs' }).waitFor();

    expect(await navLabels(page)).toEqual(['Your jobs', 'Your machines', 'Your invoices']);
    expect(await page.getByRole('banner').getByText('Jules Marchetti').count()).toBe(1);
  });

  it('says so when the password is wrong, and signs in once it is right', async () => {
    const { page } = await freshPage();
    await page.goto(`${url}/sign-in`);
    await signIn(page, 'books@ridgeback.test', 'not-the-demo-password');

    const alert = page.getByRole('alert');
    await alert.waitFor();
    expect(await alert.textContent()).toContain('That e-mail and password do not match');
    expect(page.url()).toBe(`${url}/sign-in`);
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, 'sign-in-refused.png') });

    await signIn(page, 'books@ridgeback.test');
    await page.waitForURL(`${url}/week`);
    expect(await navLabels(page)).toEqual(['Week', 'Customers & machines', 'Invoices', 'Mileage']);
  });

  it('signs out back to the sign-in page, and the session is gone', async () => {
    const { page } = await freshPage();
    await page.goto(`${url}/sign-in`);
    await signIn(page, 'owner@ridgeback.test');
    await page.waitForURL(`${url}/week`);

    await page.getByRole('banner').getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(`${url}/sign-in`);
    await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
    expect((await page.request.get(`${url}/api/auth/me`)).status()).toBe(401);

    await page.goto(`${url}/mileage`);
    await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
    expect(new URL(page.url()).searchParams.get('next')).toBe('/mileage');
  });
});
