// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { WeekReport } from '../../shared/api/reports';
import { fakeApi, requestedPaths, session } from './fake-api';
import type { FakeRoute } from './fake-api';
import { jsonResponse, renderApp } from './render-app';
import { quietReport, sampleReport } from './week-sample';

afterEach(() => {
  cleanup();
  vi.useRealTimers();
});

/** Signed in as the owner, with the week report answered by `report` for whatever start is asked. */
function ownerWithWeek(report: FakeRoute = () => jsonResponse(200, sampleReport)) {
  return fakeApi({ ...session('owner'), 'GET /api/reports/week': report });
}

const main = () => within(screen.getByRole('main'));

/** Renders the app at `path` and waits for the week page's frame (the session is known by then). */
async function openWeek(path: string) {
  const view = renderApp(path);
  await screen.findByRole('heading', { level: 1, name: 'Week' });
  return view;
}

/** The value and note of the figure tile labelled `label` (a <dt> and its <dd>s). */
function figure(label: string): string[] {
  const term = main().getByText(label, { selector: 'dt' });
  return [...term.parentElement!.querySelectorAll('dd')].map((dd) => dd.textContent ?? '');
}

const weekRequests = (fetchMock: ReturnType<typeof fakeApi>) =>
  requestedPaths(fetchMock).filter((path) => path.startsWith('/api/reports/week'));

describe('the week page', () => {
  it('shows every figure of the report, money from cents', async () => {
    const fetchMock = ownerWithWeek();
    await openWeek('/week?start=2026-11-09');

    await main().findByText('Jobs done');
    expect(weekRequests(fetchMock)).toEqual(['/api/reports/week?start=2026-11-09']);
    // Money: cents ÷ 100 with US digit grouping, by hand (147 145 ¢ = $1,471.45, and so on).
    expect(figure('Jobs done')).toEqual(['8', 'completed this week']);
    expect(figure('Hours billed')).toEqual(['6.25 h', 'labour on invoices issued']);
    expect(figure('Revenue')).toEqual(['$1,471.45', 'invoices issued, tax included']);
    expect(figure('Collected')).toEqual(['$785.52', 'payments received, refunds netted']);
    expect(figure('Unpaid')).toEqual(['$1,709.79', '8 invoices open at the week’s end']);
    expect(figure('Overdue')).toEqual(['$238.34', '✕2 invoices past the due date']);
    // 185.234 mi to one decimal, as an odometer shows it (hand rounding).
    expect(figure('Miles')).toEqual(['185.2 mi', 'finished van trips']);
    expect(figure('Deduction')).toEqual(['$134.29', 'those miles at the IRS standard rate']);
  });

  it('heads the page with the week’s dates', async () => {
    ownerWithWeek();
    await openWeek('/week?start=2026-11-09');

    await screen.findByRole('heading', { level: 1, name: 'Week' });
    // en-US date range (ECMA-402 formatRange), spaces normalised: the locale puts thin spaces around the dash.
    expect(main().getByText(/^Nov 9\s–\s15, 2026$/)).toBeTruthy();
  });

  it('lists revenue by day beside the chart, one row per day, in cents', async () => {
    ownerWithWeek();
    await openWeek('/week?start=2026-11-09');

    const table = await main().findByRole('table', { name: 'Revenue by day' });
    const rows = within(table)
      .getAllByRole('row')
      .slice(1)
      .map((row) => row.textContent);
    // 2026-11-09 is a Monday (ISO 8601 weekday, checked with JavaScript's Date, independent of the app).
    expect(new Date(2026, 10, 9).getDay()).toBe(1);
    expect(rows).toEqual([
      'Mon, Nov 9$0.00',
      'Tue, Nov 10$379.73',
      'Wed, Nov 11$613.97',
      'Thu, Nov 12$213.36',
      'Fri, Nov 13$113.75',
      'Sat, Nov 14$150.64',
      'Sun, Nov 15$0.00',
    ]);
  });

  it('counts checks by verdict in words, not colour alone', async () => {
    ownerWithWeek();
    await openWeek('/week?start=2026-11-09');

    const heading = await main().findByRole('heading', { name: 'Checks finished' });
    const items = within(heading.parentElement!)
      .getAllByRole('listitem')
      .map((item) => item.textContent);
    expect(items).toEqual(['●Pass3', '▲Warn1', '✕Fail5']);
  });

  it('lists the machines coming due with their item, status and the limit that decides first', async () => {
    ownerWithWeek();
    await openWeek('/week?start=2026-11-09');

    const heading = await main().findByRole('heading', { name: 'Machines coming due' });
    const table = within(heading.parentElement!).getByRole('table');
    const rows = within(table)
      .getAllByRole('row')
      .map((row) =>
        within(row)
          .queryAllByRole('cell')
          .map((cell) => cell.textContent),
      );
    expect(rows.slice(1)).toEqual([
      ['Kestrel Quillback 650Jules Marchetti', 'Fuel filter✕Overdue', 'Oct 10, 2026or at 18,841 mi'],
      ['Tamarack Sprucewood 700Hollis Pike', 'Engine oil and filter▲Due', 'at 6,072.6 mior Dec 10, 2026'],
      ['Tamarack Sprucewood 1000Tess Brandvold', 'In-tank strainer○Due soon', 'at 562 h'],
    ]);
  });

  it('counts the machines it does not list and links to the whole due list', async () => {
    // The report lists the most urgent only; 45 due in all, 3 listed: 45 − 3 = 42 more.
    const report: WeekReport = { ...sampleReport, machinesDueTotal: 45 };
    ownerWithWeek(() => jsonResponse(200, report));
    const { router } = await openWeek('/week?start=2026-11-09');

    const heading = await main().findByRole('heading', { name: 'Machines coming due' });
    const panel = within(heading.parentElement!);
    expect(panel.getByText(/^45 service items due soon, due or overdue by Nov 15, 2026/)).toBeTruthy();
    expect(panel.getAllByRole('row')).toHaveLength(1 + 3);
    const more = panel.getByText(/^and 42 more/);
    expect(more.textContent).toBe('and 42 more — see Reminders');
    fireEvent.click(within(more).getByRole('link', { name: 'Reminders' }));
    // Due soon included, as the count is.
    await waitFor(() => expect(router.state.location.pathname).toBe('/reminders'));
    expect(router.state.location.search).toBe('?show=soon');
  });

  it('counts the rest for the bookkeeper without a link to Reminders, a section they are not offered', async () => {
    const report: WeekReport = { ...sampleReport, machinesDueTotal: 45 };
    fakeApi({ ...session('bookkeeper'), 'GET /api/reports/week': () => jsonResponse(200, report) });
    await openWeek('/week?start=2026-11-09');

    const heading = await main().findByRole('heading', { name: 'Machines coming due' });
    const more = within(heading.parentElement!).getByText(/^and 42 more/);
    expect(more.textContent).toBe('and 42 more');
    expect(within(more).queryByRole('link')).toBeNull();
  });

  it('says nothing of more when the list is the whole of it', async () => {
    ownerWithWeek();
    await openWeek('/week?start=2026-11-09');

    await main().findByRole('heading', { name: 'Machines coming due' });
    expect(main().queryByText(/more — see/)).toBeNull();
    expect(main().queryByText(/most urgent first/)).toBeNull();
  });

  it('opens the week a mid-week date falls in, starting Monday', async () => {
    const fetchMock = ownerWithWeek();
    await openWeek('/week?start=2026-11-11');

    await main().findByText('Jobs done');
    // 2026-11-11 is a Wednesday; ISO 8601 weeks start on the Monday before it, 11-09.
    expect(weekRequests(fetchMock)).toEqual(['/api/reports/week?start=2026-11-09']);
  });

  it('steps to the previous and next weeks, and back to this one', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    // Wednesday 2026-11-18, the demo seed's "today": this week starts Monday 2026-11-16.
    vi.setSystemTime(new Date(2026, 10, 18, 10, 0));
    const fetchMock = ownerWithWeek(({ url }) =>
      jsonResponse(200, { ...sampleReport, start: url.searchParams.get('start') }),
    );
    const { router } = await openWeek('/week');

    await main().findByText('Jobs done');
    const picker = within(screen.getByRole('navigation', { name: 'Choose the week' }));
    expect(picker.getByRole('link', { name: 'This week' }).getAttribute('aria-current')).toBe('date');

    fireEvent.click(picker.getByRole('link', { name: /Previous week/ }));
    await waitFor(() => expect(router.state.location.search).toBe('?start=2026-11-09'));
    await main().findByText(/^Nov 9\s–\s15, 2026$/);
    expect(picker.getByRole('link', { name: 'This week' }).hasAttribute('aria-current')).toBe(false);

    fireEvent.click(picker.getByRole('link', { name: /Next week/ }));
    fireEvent.click(picker.getByRole('link', { name: /Next week/ }));
    await waitFor(() => expect(router.state.location.search).toBe('?start=2026-11-23'));

    fireEvent.click(picker.getByRole('link', { name: 'This week' }));
    await waitFor(() => expect(router.state.location.search).toBe('?start=2026-11-16'));
    await waitFor(() =>
      expect(weekRequests(fetchMock)).toEqual([
        '/api/reports/week?start=2026-11-16',
        '/api/reports/week?start=2026-11-09',
        '/api/reports/week?start=2026-11-23',
      ]),
    );
  });

  it('jumps to the week of a day typed in the date field', async () => {
    const fetchMock = ownerWithWeek();
    const { router } = await openWeek('/week?start=2026-11-09');
    await main().findByText('Jobs done');

    // 2026-03-31 is a Tuesday; its week starts Monday 2026-03-30 (ISO 8601).
    fireEvent.change(screen.getByLabelText('Go to the week of'), { target: { value: '2026-03-31' } });

    await waitFor(() => expect(router.state.location.search).toBe('?start=2026-03-30'));
    await waitFor(() => expect(weekRequests(fetchMock)).toContain('/api/reports/week?start=2026-03-30'));
  });

  it('says so when the address names a day that does not exist, and shows this week', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date(2026, 10, 18, 10, 0));
    const fetchMock = ownerWithWeek();
    await openWeek('/week?start=2026-02-30');

    expect(await main().findByText(/asked for a date that does not exist/)).toBeTruthy();
    expect(weekRequests(fetchMock)).toEqual(['/api/reports/week?start=2026-11-16']);
  });

  it('shows a loading state until the report arrives', async () => {
    ownerWithWeek(() => new Promise<Response>(() => {}));
    await openWeek('/week?start=2026-11-09');

    expect((await main().findByRole('status')).textContent).toBe('Loading the week’s figures…');
    expect(main().queryByText('Jobs done')).toBeNull();
  });

  it('says what failed and tries again on request', async () => {
    let failing = true;
    ownerWithWeek(() =>
      failing
        ? jsonResponse(500, { error: { code: 'internal', message: 'Something went wrong on the server.' } })
        : jsonResponse(200, sampleReport),
    );
    await openWeek('/week?start=2026-11-09');

    const alert = await main().findByRole('alert');
    expect(within(alert).getByText('The week review could not be loaded')).toBeTruthy();
    expect(alert.textContent).toContain(
      'The server answered 500 (internal): Something went wrong on the server.',
    );

    failing = false;
    fireEvent.click(within(alert).getByRole('button', { name: 'Try again' }));
    expect(await main().findByText('Jobs done')).toBeTruthy();
    expect(main().queryByRole('alert')).toBeNull();
  });

  it('says what to do next in a week with nothing in it', async () => {
    ownerWithWeek(() => jsonResponse(200, quietReport));
    await openWeek('/week?start=2026-11-23');

    expect(await main().findByRole('heading', { name: 'Nothing was recorded in this week' })).toBeTruthy();
    expect(main().getByText(/No invoice was issued this week/)).toBeTruthy();
    expect(main().getByText(/No guided check was finished this week/)).toBeTruthy();
    expect(main().getByText(/No machine is due for service by Nov 29, 2026/)).toBeTruthy();
    expect(main().queryByRole('table')).toBeNull();
    expect(figure('Overdue')).toEqual(['$0.00', '0 invoices past the due date']);
  });

  it('says the deduction is not known when a trip has no IRS rate', async () => {
    const report: WeekReport = { ...sampleReport, deductionCents: null };
    ownerWithWeek(() => jsonResponse(200, report));
    await openWeek('/week?start=2026-11-09');

    await main().findByText('Deduction');
    expect(figure('Deduction')).toEqual(['Not known', 'a trip falls on a day with no IRS rate on file']);
  });

  it('is the bookkeeper’s home too', async () => {
    fakeApi({ ...session('bookkeeper'), 'GET /api/reports/week': () => jsonResponse(200, sampleReport) });
    const { router } = await openWeek('/');

    await main().findByText('Jobs done');
    expect(router.state.location.pathname).toBe('/week');
    expect(figure('Revenue')[0]).toBe('$1,471.45');
  });
});
