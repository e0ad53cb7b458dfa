import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, SCREENSHOT_DIR } from '../helpers/browser';
import { startDashboardServer } from '../helpers/dashboard-server';

describe('the dashboard in Chromium', () => {
  let dashboard: Awaited<ReturnType<typeof startDashboardServer>>;
  let browser: Browser;
  let page: Page;
  let url: string;
  const requested: string[] = [];
  beforeAll(async () => {
    dashboard = await startDashboardServer();
    url = dashboard.url;
    browser = await launchBrowser();
    page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    page.on('request', (request) => requested.push(request.url()));
  });
  afterAll(async () => {
    await browser?.close();
    await dashboard?.close();
  });

  it('opens on sign-in with the live API status, then the week page for the owner', async () => {
    await page.goto(url);
    await page.getByText('API online').waitFor();
    await page.getByLabel('E-mail').fill('owner@ridgeback.test');
    await page.getByLabel('Password').fill('vanbay-demo-2026');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('navigation', { name: 'Sections' }).waitFor();
    expect(await page.getByRole('navigation').getByRole('link').count()).toBeGreaterThanOrEqual(7);
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, 'week.png'), fullPage: true });
  });

  it('loads the shipped font, not one from the network', async () => {
    const fonts = await page.evaluate(async () => {
      await document.fonts.ready;
      return [...document.fonts].filter((f) => f.status === 'loaded').map((f) => f.family);
    });
    expect(fonts.some((family) => family.includes('Space Grotesk'))).toBe(true);
    expect(requested.some((address) => /\.woff2?$/.test(address))).toBe(true);
    expect(requested.filter((address) => !address.startsWith(url))).toEqual([]);
  });

  it('moves between sections from the navigation and on a deep link', async () => {
    await page.getByRole('navigation').getByRole('link', { name: /jobs/i }).click();
    await page.waitForURL(/\/jobs$/);
    await page.getByRole('heading', { level: 1, name: 'Jobs' }).waitFor();
    await page
      .getByRole('link', { name: /^#\d+$/ })
      .first()
      .waitFor();
    await page.goto(`${url}/mileage`);
    await page
      .getByRole('heading', { level: 1 })
      .filter({ hasText: /mileage/i })
      .waitFor();
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, 'mileage.png') });
  });

  it('says when the API is down instead of showing stale or invented data', async () => {
    await page.goto(url);
    await page.getByText('Server online').waitFor();
    await page.route('**/api/health', (route) => route.abort('connectionrefused'));
    await page.reload();
    await page.getByText(/API unreachable/).waitFor();
    await page.screenshot({ path: path.join(SCREENSHOT_DIR, 'week-offline.png') });
  });
});
