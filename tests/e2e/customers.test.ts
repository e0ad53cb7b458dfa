import type { AddressInfo } from 'node:net';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { CLIENT_DIR } from '../../server/build-client';
import { startFakeSmtp } from '../../server/mail/fake-smtp';
import type { FakeSmtp } from '../../server/mail/fake-smtp';
import { createMailer } from '../../server/mail/mailer';
import type { Mailer } from '../../server/mail/mailer';
import { launchBrowser, SCREENSHOT_DIR } from '../helpers/browser';
import { cloneDatabase, tempUploadsDir } from '../helpers/db';
import { SEED_TODAY } from '../helpers/fixtures';

/**
 * The built dashboard over a seeded clone, like tests/helpers/dashboard-server.ts, but with the
 * seed's own today (so the due list is the seeded one) and mail to a local fake SMTP server, so a
 * reminder really leaves.
 */
async function startServer() {
  const database = await cloneDatabase('seeded');
  const smtp: FakeSmtp = await startFakeSmtp();
  const mailer: Mailer = createMailer({ host: smtp.host, port: smtp.port });
  const server = createApp({
    db: database.db,
    clientDir: CLIENT_DIR,
    uploadsDir: tempUploadsDir(),
    clock: () => new Date(SEED_TODAY),
    mailer,
  }).listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    smtp,
    close: async () => {
      await new Promise((resolve) => server.close(resolve));
      mailer.close();
      await smtp.close();
      await database.close();
    },
  };
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

describe('customers, machines and reminders in Chromium', () => {
  let app: Awaited<ReturnType<typeof startServer>>;
  let browser: Browser;
  let page: Page;
  beforeAll(async () => {
    app = await startServer();
    browser = await launchBrowser();
    page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, app.url, 'owner@ridgeback.test');
  });
  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('goes from the customer list to a machine, its history and its specs, and saves a spec', async () => {
    await page.goto(`${app.url}/customers`);
    await page.getByRole('link', { name: 'Jules Marchetti' }).waitFor();
    await shot(page, 'customers.png');

    await page.getByRole('link', { name: 'Jules Marchetti' }).click();
    await page.getByRole('heading', { level: 1, name: 'Jules Marchetti' }).waitFor();
    const machines = page.getByRole('table', { name: 'This customer’s machines' });
    await machines.getByRole('link', { name: '2019 Kestrel Quillback 650' }).waitFor();
    await shot(page, 'customer.png');

    await machines.getByRole('link', { name: '2019 Kestrel Quillback 650' }).click();
    await page.getByRole('heading', { level: 1, name: '2019 Kestrel Quillback 650' }).waitFor();
    // The history arrives after the machine: wait for its first visit before counting.
    const visits = page.getByRole('list', { name: 'Visits, newest first' }).getByRole('article');
    await visits.first().waitFor();
    await visits.first().getByText('Readings and line items').click();
    await visits
      .first()
      .getByRole('table', { name: /^Readings on job/ })
      .waitFor();

    // The VIN as typed: one character off the seeded VIN's check digit is caught before saving.
    await page.getByRole('button', { name: 'Edit details' }).click();
    const details = page.getByRole('form', { name: 'Machine details' });
    await details.getByLabel('VIN').fill('7V9KT6508KC104382');
    await details.getByText(/this VIN needs 7: a character is mistyped/).waitFor();
    await details.screenshot({ path: path.join(SCREENSHOT_DIR, 'machine-vin.png') });
    await details.getByRole('button', { name: 'Cancel' }).click();

    // The seeded manual figure for this machine's highest pressure is 46 psi (server/db/seed-data.ts).
    const specs = page.getByRole('form', { name: 'Fuel specs' });
    const highest = specs.getByLabel('Fuel pressure, highest');
    expect(await highest.inputValue()).toBe('46 psi');
    await highest.fill('3.1 bar');
    await specs.getByRole('button', { name: 'Save specs' }).click();
    await specs.getByText(/Specs saved/).waitFor();
    await shot(page, 'machine.png');

    // 3.1 bar = 310 kPa = 44.96 psi (1 bar = 100 kPa, 1 psi = 6.894 757 kPa; NIST SP 811 B.8): stored, not just shown.
    await page.reload();
    expect(
      await page.getByRole('form', { name: 'Fuel specs' }).getByLabel('Fuel pressure, highest').inputValue(),
    ).toBe('45 psi');
  });

  it('sends a service reminder that reaches the customer’s mailbox', async () => {
    await page.goto(`${app.url}/reminders`);
    const send = page.getByRole('button', { name: /^Send reminder: Fuel filter, Tamarack Sprucewood 700/ });
    await send.click();
    await page.getByText('Sent to hollis@example.test.').waitFor();
    await page.getByRole('button', { name: /^Send again: Fuel filter, Tamarack Sprucewood 700/ }).waitFor();
    await shot(page, 'reminders.png');
    const mail = app.smtp.messages.find((message) => message.envelopeTo.includes('hollis@example.test'));
    expect(mail?.subject).toMatch(/fuel filter due/i);
  });

  it('shows the customer their own machines only, with nothing to edit', async () => {
    // A phone in its dark setting: the night palette (tailwind.config.ts).
    const phone = await browser.newPage({ viewport: { width: 390, height: 844 }, colorScheme: 'dark' });
    try {
      await signIn(phone, app.url, 'jules@example.test');
      await phone.getByRole('navigation').getByRole('link', { name: 'Your machines' }).click();
      await phone.getByRole('heading', { level: 1, name: 'Your machines' }).waitFor();
      const table = phone.getByRole('table', { name: 'Your machines' });
      await table.getByRole('link', { name: '2019 Kestrel Quillback 650' }).waitFor();
      // Jules has two machines in the seed (server/db/seed-data.ts), and no one else's shows.
      expect(await table.getByRole('link').allInnerTexts()).toEqual(
        expect.arrayContaining(['2019 Kestrel Quillback 650', '2021 Tamarack Larch 570']),
      );
      expect(await table.getByRole('link').count()).toBe(2);
      expect(await phone.getByRole('main').getByRole('button').count()).toBe(0);
      await shot(phone, 'your-machines.png');

      await table.getByRole('link', { name: '2019 Kestrel Quillback 650' }).click();
      await phone.getByRole('heading', { level: 1, name: '2019 Kestrel Quillback 650' }).waitFor();
      await phone.getByRole('list', { name: 'Visits, newest first' }).waitFor();
      expect(await phone.getByRole('main').getByRole('textbox').count()).toBe(0);
      expect(await phone.getByRole('main').getByRole('button').count()).toBe(0);
      await shot(phone, 'your-machine.png');
    } finally {
      await phone.close();
    }
  });
});
