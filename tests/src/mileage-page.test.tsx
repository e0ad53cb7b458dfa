// @vitest-environment jsdom
import { cleanup, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { MileageTotals, Trip, TripSummary } from '../../shared/api/trips';
import type { Role } from '../../shared/api/users';
import { fakeApi, requestedPaths, session } from './fake-api';
import type { FakeRoute } from './fake-api';
import { jsonResponse, renderApp } from './render-app';
import { sampleReport } from './week-sample';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const none: MileageTotals = { trips: 0, miles: 0, deductionCents: 0 };

/**
 * A 2026 summary as GET /api/trips/summary answers it. The year's deduction is its own figure
 * (the year's miles × 72.5 ¢ rounded once), one cent off the two months added up (51 301 + 36 620
 * = 87 921): the page must show what the API says for each, not a sum of its own.
 */
const summary: TripSummary = {
  year: 2026,
  months: Array.from({ length: 12 }, (_, i) => {
    const month = `2026-${String(i + 1).padStart(2, '0')}`;
    if (month === '2026-10') return { month, trips: 25, miles: 707.6, deductionCents: 51_301 };
    if (month === '2026-11') return { month, trips: 20, miles: 505.1, deductionCents: 36_620 };
    return { month, ...none };
  }),
  total: { trips: 45, miles: 1212.7, deductionCents: 87_922 },
};

const trip = (fields: Partial<Trip>): Trip => ({
  id: 1,
  jobId: null,
  tripDate: '2026-11-18',
  startOdometer: 49_403.4,
  endOdometer: 49_423.1,
  odometerUnit: 'mi',
  miles: 19.7,
  origin: null,
  destination: 'Imani Castellanos, Lantern Creek',
  purpose: 'Service call: Kestrel Skimmer 1500',
  startedAt: null,
  endedAt: null,
  rateCentsPerMile: 72.5,
  deductionCents: 1428,
  createdAt: '2026-11-18T20:00:00.000Z',
  ...fields,
});

const trips: Trip[] = [
  trip({
    id: 2,
    startOdometer: 49_423.1,
    endOdometer: null,
    miles: null,
    deductionCents: null,
    destination: 'Otis Fairweather, Cinder Valley',
  }),
  trip({ id: 1 }),
];

function mileageServer(role: Role, extra: Record<string, FakeRoute> = {}) {
  return fakeApi({
    ...session(role),
    'GET /api/trips/summary': () => jsonResponse(200, summary),
    'GET /api/trips': () => jsonResponse(200, { items: trips, nextCursor: null }),
    'GET /api/reports/week': () => jsonResponse(200, sampleReport),
    ...extra,
  });
}

const main = () => within(screen.getByRole('main'));

async function openMileage(path: string) {
  renderApp(path);
  await screen.findByRole('heading', { level: 1, name: 'Mileage' });
  return main();
}

/** A table's body and foot rows as "cell | cell | …". */
function rowsOf(table: HTMLElement): string[] {
  return within(table)
    .getAllByRole('row')
    .slice(1)
    .map((row) => [...row.children].map((cell) => cell.textContent?.trim()).join(' | '));
}

describe('the mileage page', () => {
  it('shows the tax year and each month as the API totals them, the year not re-added', async () => {
    const fetchMock = mileageServer('bookkeeper');
    const page = await openMileage('/mileage?year=2026&week=2026-11-11');

    const months = await page.findByRole('table', { name: 'Month by month, 2026' });
    const rows = rowsOf(months);
    expect(rows[9]).toBe('October | 25 | 707.6 mi | $513.01');
    expect(rows[10]).toBe('November | 20 | 505.1 mi | $366.20');
    expect(rows[0]).toBe('January | 0 | 0 mi | $0.00');
    // The API's year figure, 87 922 ¢, not the months' 87 921 ¢.
    expect(rows[12]).toBe('Tax year 2026 | 45 | 1,212.7 mi | $879.22');
    const deduction = page.getByText('Deduction', { selector: 'dt' }).parentElement!;
    expect(deduction.textContent).toContain('$879.22');
    // IRS Notice 2026-10: 72.5 ¢ a mile for 2026 (shared/mileage.ts).
    expect(deduction.textContent).toContain('72.5¢/mi');
    expect(requestedPaths(fetchMock)).toContain('/api/trips/summary?year=2026');
  });

  it('says "Not known" where the API has no deduction', async () => {
    mileageServer('owner', {
      'GET /api/trips/summary': () =>
        jsonResponse(200, { ...summary, total: { ...summary.total, deductionCents: null } }),
    });
    const page = await openMileage('/mileage?year=2026');
    const months = await page.findByRole('table', { name: 'Month by month, 2026' });
    expect(rowsOf(months)[12]).toBe('Tax year 2026 | 45 | 1,212.7 mi | Not known');
    expect(page.getByText('a trip falls on a day with no IRS rate on file')).toBeTruthy();
  });

  it('shows the week the address names, Monday to Sunday, from the week report', async () => {
    const fetchMock = mileageServer('owner');
    const page = await openMileage('/mileage?year=2026&week=2026-11-11');

    // 2026-11-09 is the Monday of the week of 2026-11-11 (ISO 8601; checked with JavaScript's Date).
    expect(new Date(2026, 10, 9).getDay()).toBe(1);
    expect(await page.findByText('185.2 mi')).toBeTruthy();
    // The report's 13 429 ¢, as dollars by hand.
    expect(page.getByText('Week’s deduction').nextElementSibling?.textContent).toBe('$134.29');
    expect(requestedPaths(fetchMock)).toContain('/api/reports/week?start=2026-11-09');
  });

  it('does not ask a helper’s sign-in for the week report it may not read', async () => {
    const fetchMock = mileageServer('helper');
    const page = await openMileage('/mileage?year=2026&week=2026-11-11');
    await page.findByRole('table', { name: 'Month by month, 2026' });
    expect(page.getByText(/Week totals come from the week review/)).toBeTruthy();
    expect(requestedPaths(fetchMock).some((path) => path.startsWith('/api/reports/week'))).toBe(false);
  });

  it('lists the year’s trips, an open one as under way, and links the year’s CSV', async () => {
    const fetchMock = mileageServer('bookkeeper');
    const page = await openMileage('/mileage?year=2026');

    const log = await page.findByRole('table', { name: 'Trip log, 2026' });
    const rows = rowsOf(log);
    expect(rows[0]).toContain('Under way');
    expect(rows[0]).toContain('49,423.1 → … mi');
    expect(rows[1]).toContain('49,403.4 → 49,423.1 mi | 19.7 mi | 72.5¢/mi | $14.28');
    expect(requestedPaths(fetchMock)).toContain('/api/trips?from=2026-01-01&to=2026-12-31&limit=25');
    expect(page.getByRole('link', { name: 'Export 2026 as CSV' }).getAttribute('href')).toBe(
      '/api/trips/export.csv?from=2026-01-01&to=2026-12-31',
    );
  });
});
