// @vitest-environment jsdom
import { cleanup, fireEvent, screen, within } from '@testing-library/react';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { OutboxItem } from '../../shared/api/outbox';
import type { DueItem } from '../../shared/api/reminders';
import { fakeApi, requestedPaths, session } from './fake-api';
import { dueItem, list } from './machine-sample';
import { currentPath, jsonResponse, renderApp } from './render-app';

// The page's lazy module is transformed on first import, which on a busy machine can outlast
// Testing Library's wait; importing it once up front leaves each test only the page's own work.
beforeAll(async () => {
  await import('../../src/app/routes/reminders');
});

afterEach(() => {
  cleanup();
});

const main = () => within(screen.getByRole('main'));

function outboxItem(overrides: Partial<OutboxItem> = {}): OutboxItem {
  return {
    id: 7,
    kind: 'reminder',
    to: 'hollis@example.test',
    subject: '2019 Tamarack Sprucewood 700: fuel filter due',
    status: 'sent',
    attempts: 1,
    lastError: null,
    attachments: [],
    invoiceId: null,
    jobId: null,
    sentAt: '2026-11-18T15:00:00.000Z',
    createdAt: '2026-11-18T15:00:00.000Z',
    ...overrides,
  };
}

/** Renders the page and waits for its heading: `main` is the page's own once the session is known. */
async function openReminders() {
  const view = renderApp('/reminders');
  await screen.findByRole('heading', { level: 1, name: 'Reminders' });
  return view;
}

/** A POST's path and method, in the order the page sent them. */
function writes(fetchMock: ReturnType<typeof fakeApi>): string[] {
  return fetchMock.mock.calls
    .filter(([, init]) => init?.method === 'POST')
    .map(([input]) => {
      const url = new URL(String(input), 'http://vanbay.test');
      return `POST ${url.pathname}${url.search}`;
    });
}

describe('the reminders page', () => {
  it('lists due and overdue items, most urgent first, and can include those due soon', async () => {
    const soon = dueItem({
      serviceIntervalId: 40,
      status: 'due_soon',
      label: 'Engine oil and filter',
      remaining: { days: 20, meter: 900 },
    });
    const overdue = dueItem({ serviceIntervalId: 10 });
    const fetchMock = fakeApi({
      ...session('owner'),
      // The server pages by interval id, newest first, whatever the status.
      'GET /api/reminders': ({ url }) =>
        jsonResponse(
          200,
          list(url.searchParams.get('status')?.includes('due_soon') ? [soon, overdue] : [overdue]),
        ),
    });
    const { router } = renderApp('/reminders');
    await screen.findByRole('heading', { level: 1, name: 'Reminders' });
    expect(await main().findByText('Overdue')).toBeTruthy();
    expect(requestedPaths(fetchMock)).toContain('/api/reminders?status=overdue%2Cdue&limit=50');

    fireEvent.click(main().getByRole('button', { name: 'Due soon too' }));
    await main().findByText('Engine oil and filter');
    expect(currentPath(router)).toBe('/reminders?show=soon');
    const rows = main().getAllByRole('rowheader');
    expect(rows).toHaveLength(2);
    const services = main()
      .getAllByRole('row')
      .slice(1)
      .map((row) => within(row).getAllByRole('cell')[0]!.textContent);
    expect(services[0]).toContain('Overdue');
    expect(services[1]).toContain('Due soon');
  });

  it('writes the reminder, mails it, and shows it sent', async () => {
    let current: DueItem = dueItem();
    const fetchMock = fakeApi({
      ...session('owner'),
      'GET /api/reminders': () => jsonResponse(200, list([current])),
      'POST /api/reminders': () =>
        jsonResponse(201, {
          id: 4,
          serviceIntervalId: 28,
          machineId: 13,
          customerId: 9,
          dueOn: '2026-10-10',
          status: 'pending',
          sentAt: null,
          createdAt: '2026-11-18T15:00:00.000Z',
        }),
      'POST /api/reminders/4/send': () => {
        current = dueItem({ reminder: { id: 4, status: 'sent', sentAt: '2026-11-18T15:00:00.000Z' } });
        return jsonResponse(202, outboxItem());
      },
    });
    await openReminders();
    fireEvent.click(await main().findByRole('button', { name: /^Send reminder: Fuel filter/ }));
    expect(await main().findByText('Sent to hollis@example.test.')).toBeTruthy();
    expect(await main().findByRole('button', { name: /^Send again: Fuel filter/ })).toBeTruthy();
    expect(writes(fetchMock)).toEqual(['POST /api/reminders', 'POST /api/reminders/4/send']);
  });

  it('sends a written reminder again only as “again”, and says why a send failed', async () => {
    const fetchMock = fakeApi({
      ...session('owner'),
      'GET /api/reminders': () =>
        jsonResponse(
          200,
          list([dueItem({ reminder: { id: 4, status: 'sent', sentAt: '2026-11-10T15:00:00.000Z' } })]),
        ),
      'POST /api/reminders/4/send': () =>
        jsonResponse(503, { error: { code: 'mail_not_set_up', message: 'mail is not set up' } }),
    });
    await openReminders();
    fireEvent.click(await main().findByRole('button', { name: /^Send again/ }));
    expect(
      await main().findByText(/Not sent\. The server could not do this \(503\): mail is not set up/),
    ).toBeTruthy();
    expect(writes(fetchMock)).toEqual(['POST /api/reminders/4/send?again=true']);
  });

  it('says a reminder whose mail waits in the outbox is retried on its own, and tries it at once when asked', async () => {
    const fetchMock = fakeApi({
      ...session('owner'),
      'GET /api/reminders': () =>
        jsonResponse(200, list([dueItem({ reminder: { id: 4, status: 'pending', sentAt: null } })])),
      'POST /api/reminders/4/send': ({ url }) =>
        url.searchParams.get('again') === 'true'
          ? jsonResponse(202, outboxItem({ attempts: 2 }))
          : jsonResponse(409, {
              error: {
                code: 'conflict',
                message:
                  'This reminder is waiting in the outbox and is tried again on its own; send it again to try it now.',
                details: { mailIds: [7], waiting: true },
              },
            }),
    });
    await openReminders();
    fireEvent.click(await main().findByRole('button', { name: /^Send reminder: Fuel filter/ }));
    expect(
      await main().findByText('Its mail is waiting in the outbox and is tried again on its own.'),
    ).toBeTruthy();
    fireEvent.click(main().getByRole('button', { name: /^Try it now: Fuel filter/ }));
    expect(await main().findByText('Sent to hollis@example.test.')).toBeTruthy();
    expect(writes(fetchMock)).toEqual([
      'POST /api/reminders/4/send',
      'POST /api/reminders/4/send?again=true',
    ]);
  });

  it('offers no send to the helper, who may read the list but not mail customers', async () => {
    fakeApi({
      ...session('helper'),
      'GET /api/reminders': () => jsonResponse(200, list([dueItem()])),
    });
    await openReminders();
    await main().findByText('Not reminded yet.');
    expect(main().queryByRole('button', { name: /send/i })).toBeNull();
  });
});
