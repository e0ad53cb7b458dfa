/**
 * The security headers (server/http/security-headers.ts): what helmet sets on a small app of the
 * test's own, and the built dashboard working under the Content Security Policy in Chromium with
 * not one violation — served by the real app mounted behind the middleware, as app.ts will mount it.
 */
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { sql } from 'drizzle-orm';
import express from 'express';
import type { Browser, Page } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { CLIENT_DIR } from '../../server/build-client';
import { DEMO_PASSWORD } from '../../server/db/seed-data';
import { queryRows, type Database } from '../../server/db/client';
import { securityHeaders } from '../../server/http/security-headers';
import { launchBrowser } from '../helpers/browser';
import { cloneDatabase, tempUploadsDir } from '../helpers/db';

/** A CSP header as a map of directive → its source list (CSP Level 3 §2.2: `;`-separated, space-split). */
function directives(header: string): Record<string, string[]> {
  return Object.fromEntries(
    header
      .split(';')
      .map((part) => part.trim().split(/\s+/))
      .filter((tokens) => tokens[0])
      .map(([name, ...sources]) => [name!.toLowerCase(), sources]),
  );
}

describe('the security headers on an app of their own', () => {
  const app = express();
  app.use(securityHeaders());
  app.get('/page', (_req, res) => void res.type('html').send('<!doctype html><p>hello</p>'));
  app.get('/api/thing', (_req, res) => void res.json({ ok: true }));

  it('sends the dashboard a strict CSP: this origin only, no inline script or style, no framing', async () => {
    const response = await request(app).get('/page').expect(200);
    const csp = directives(String(response.headers['content-security-policy']));
    // The expected policy, written out here rather than read from the module under test.
    expect(csp).toEqual({
      'default-src': ["'self'"],
      'script-src': ["'self'"],
      'script-src-attr': ["'none'"],
      'style-src': ["'self'"],
      'style-src-attr': ["'none'"],
      'img-src': ["'self'"],
      'font-src': ["'self'"],
      'connect-src': ["'self'"],
      // Its own invoice PDF in an <object>; nothing from elsewhere.
      'object-src': ["'self'"],
      'base-uri': ["'none'"],
      'form-action': ["'self'"],
      'frame-ancestors': ["'none'"],
    });
    for (const sources of Object.values(csp)) {
      expect(sources).not.toContain("'unsafe-inline'");
      expect(sources).not.toContain("'unsafe-eval'");
      expect(sources).not.toContain('*');
    }
    // Plain http on the van's network must keep working: no forced upgrade to https.
    expect(csp).not.toHaveProperty('upgrade-insecure-requests');
  });

  it('lets only the dashboard itself frame an API answer, and sets no resource policy on it', async () => {
    const response = await request(app).get('/api/thing').expect(200);
    // A PDF must open in Chrome's viewer and inside the dashboard's <object> (crbug.com/271452).
    expect(directives(String(response.headers['content-security-policy']))).toEqual({
      'frame-ancestors': ["'self'"],
    });
    expect(response.headers['x-frame-options']).toBe('SAMEORIGIN');
  });

  it('sends the other hardening headers on pages and JSON alike', async () => {
    for (const path of ['/page', '/api/thing']) {
      const { headers } = await request(app).get(path).expect(200);
      // Values as the OWASP Secure Headers Project recommends them (from memory) and helmet 8 sets them.
      expect(headers['x-content-type-options'], path).toBe('nosniff');
      expect(headers['referrer-policy'], path).toBe('no-referrer');
      expect(headers['cross-origin-opener-policy'], path).toBe('same-origin');
      expect(headers['cross-origin-resource-policy'], path).toBe('same-origin');
      expect(headers['x-permitted-cross-domain-policies'], path).toBe('none');
      expect(headers['x-dns-prefetch-control'], path).toBe('off');
      // X-XSS-Protection: 0 turns off the old filters, which could be abused (OWASP, from memory).
      expect(headers['x-xss-protection'], path).toBe('0');
      expect(headers['strict-transport-security'], path).toMatch(/^max-age=\d{7,}/);
      expect(headers['x-powered-by'], path).toBeUndefined();
    }
    expect((await request(app).get('/page')).headers['x-frame-options']).toBe('DENY');
  });
});

describe('the built dashboard under the CSP, in Chromium', () => {
  let database: Database;
  let server: Server;
  let url: string;
  let browser: Browser;
  let page: Page;
  /** Violations the page reported (`securitypolicyviolation`, CSP Level 3 §5.3) and console errors. */
  const violations: string[] = [];
  const consoleErrors: string[] = [];

  beforeAll(async () => {
    database = await cloneDatabase('seeded');
    const app = express();
    app.use(securityHeaders());
    app.use(createApp({ db: database.db, clientDir: CLIENT_DIR, uploadsDir: tempUploadsDir() }));
    server = app.listen(0, '127.0.0.1');
    await new Promise((resolve) => server.once('listening', resolve));
    url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    browser = await launchBrowser();
    page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.exposeFunction('reportViolation', (text: string) => void violations.push(text));
    await page.addInitScript(() => {
      document.addEventListener('securitypolicyviolation', (event) => {
        const report = (window as unknown as { reportViolation(text: string): void }).reportViolation;
        report(
          `${event.violatedDirective} blocked ${event.blockedURI || 'inline'} (${event.sourceFile}:${event.lineNumber})`,
        );
      });
    });
    page.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
  });
  afterAll(async () => {
    await browser?.close();
    await new Promise((resolve) => server?.close(resolve));
    await database?.close();
  });

  it('signs in and draws the week with its revenue chart and the shipped font, with no violation', async () => {
    const response = await page.goto(`${url}/sign-in?next=${encodeURIComponent('/week?start=2026-11-09')}`);
    expect(response?.headers()['content-security-policy']).toContain("script-src 'self'");
    await page.getByLabel('E-mail').fill('owner@ridgeback.test');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(`${url}/week?start=2026-11-09`);
    // The seeded week of 2026-11-09 has revenue, so the (lazily loaded) chart draws its bars.
    await page.locator('.recharts-bar-rectangle').first().waitFor();
    const fonts = await page.evaluate(async () => {
      await document.fonts.ready;
      return [...document.fonts].filter((font) => font.status === 'loaded').map((font) => font.family);
    });
    expect(fonts.some((family) => family.includes('Space Grotesk'))).toBe(true);
    // The stylesheet applied: the page's type comes from it (the browser default is a serif).
    const bodyFont = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(bodyFont).toContain('Space Grotesk');
    expect(violations).toEqual([]);
    expect(consoleErrors.filter((text) => /Content Security Policy/i.test(text))).toEqual([]);
  });

  it('shows an invoice, its PDF embedded, and a job with no violation either', async () => {
    const before = violations.length;
    const [invoice] = await queryRows<{ id: number }>(
      database.db,
      sql`select id from invoices order by id limit 1`,
    );
    const [job] = await queryRows<{ id: number }>(database.db, sql`select id from jobs order by id limit 1`);
    const pdf = await page.request.get(`${url}/api/invoices/${invoice!.id}/pdf`);
    expect(pdf.status()).toBe(200);
    expect(directives(pdf.headers()['content-security-policy'] ?? '')).toEqual({
      'frame-ancestors': ["'self'"],
    });
    for (const path of [`/jobs/${job!.id}`, `/invoices/${invoice!.id}`]) {
      await page.goto(`${url}${path}`);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
    }
    // The invoice's <object> fetches its PDF after the page has drawn: let it.
    await page.waitForLoadState('networkidle');
    expect(violations.slice(before)).toEqual([]);
  });

  it('really enforces it: an injected inline script does not run and is reported', async () => {
    const before = violations.length;
    const ran = await page.evaluate(() => {
      const script = document.createElement('script');
      script.textContent = 'window.__inlineRan = true';
      document.body.append(script);
      return (window as unknown as { __inlineRan?: boolean }).__inlineRan === true;
    });
    expect(ran).toBe(false);
    await expect.poll(() => violations.length).toBeGreaterThan(before);
    expect(violations.slice(before).join('\n')).toMatch(/^script-src(-elem)? blocked inline/);
  });
});
