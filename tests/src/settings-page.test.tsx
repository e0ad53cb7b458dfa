// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { BusinessSettings, UpdateBusinessInput } from '../../shared/api/business';
import { businessSample } from './business-sample';
import type { User } from '../../shared/api/users';
import { demoUsers, fakeApi, session, type FakeRoute } from './fake-api';
import type { OutboxItem } from '../../shared/api/outbox';
import { jsonResponse, renderApp } from './render-app';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const settings = businessSample;

const users: User[] = Object.values(demoUsers).map((user) => ({
  ...user,
  disabled: false,
  lastSignInAt: null,
  createdAt: '2026-01-05T15:00:00.000Z',
}));

function settingsServer(extra: Record<string, FakeRoute> = {}) {
  let current = settings;
  const patches: UpdateBusinessInput[] = [];
  fakeApi({
    ...session('owner'),
    'GET /api/business': () => jsonResponse(200, current),
    'PATCH /api/business': ({ init }) => {
      const patch = JSON.parse(String(init?.body)) as UpdateBusinessInput;
      patches.push(patch);
      current = { ...current, ...patch } as BusinessSettings;
      return jsonResponse(200, current);
    },
    'GET /api/users': () => jsonResponse(200, { items: users, nextCursor: null }),
    ...extra,
  });
  return patches;
}

async function section(name: string) {
  renderApp('/settings');
  await screen.findByRole('heading', { level: 1, name: 'Settings' });
  return within(await screen.findByRole('form', { name }));
}

describe('the settings page', () => {
  it('shows the stored rates as typed figures: cents as dollars, basis points and ppm as percents', async () => {
    settingsServer();
    const rates = await section('Rates');
    // By hand: 9 500 ¢ = $95.00; 2 500 bps = 25 %.
    expect((rates.getByLabelText('Labour rate ($ per hour)') as HTMLInputElement).value).toBe('95.00');
    expect((rates.getByLabelText('Parts markup (%)') as HTMLInputElement).value).toBe('25');
    const tax = within(screen.getByRole('form', { name: 'Tax' }));
    // 62 500 ppm = 6.25 %.
    expect((tax.getByLabelText('Sales tax rate (%)') as HTMLInputElement).value).toBe('6.25');
  });

  it('saves only what changed, a tax rate of 8.875 % as 88 750 ppm', async () => {
    const patches = settingsServer();
    const tax = await section('Tax');
    fireEvent.change(tax.getByLabelText('Sales tax rate (%)'), { target: { value: '8.875' } });
    fireEvent.click(tax.getByRole('button', { name: 'Save tax' }));

    await tax.findByText(/^Saved\.$/);
    // 8.875 % × 10 000 = 88 750 parts per million (by hand).
    expect(patches).toEqual([{ taxRatePpm: 88_750 }]);
  });

  it('refuses a rate with more than two decimals of a cent beside the field, and sends nothing', async () => {
    const patches = settingsServer();
    const rates = await section('Rates');
    const field = rates.getByLabelText('Labour rate ($ per hour)');
    fireEvent.change(field, { target: { value: '95.125' } });
    fireEvent.click(rates.getByRole('button', { name: 'Save rates' }));

    await waitFor(() => expect(field.getAttribute('aria-invalid')).toBe('true'));
    expect(rates.getByText('Dollars and cents, e.g. 95.00.')).toBeTruthy();
    expect(patches).toEqual([]);
  });

  it('works the trip fee rule through examples as it is typed', async () => {
    settingsServer();
    const fee = await section('Trip fee');
    // By hand with $35.00 covering 15 miles and $1.50 a mile after: 10 mi $35.00;
    // 25 mi 35.00 + 10 × 1.50 = $50.00; 40 mi 35.00 + 25 × 1.50 = $72.50.
    expect(fee.getByText(/10 miles \$35\.00 · 25 miles \$50\.00 · 40 miles \$72\.50/)).toBeTruthy();
    fireEvent.change(fee.getByLabelText('Each mile past those ($)'), { target: { value: '2' } });
    // 25 mi: 35.00 + 10 × 2.00 = $55.00; 40 mi: 35.00 + 25 × 2.00 = $85.00.
    expect(await fee.findByText(/25 miles \$55\.00 · 40 miles \$85\.00/)).toBeTruthy();
  });

  it('lists who may sign in, with their roles, the owner marked as themselves', async () => {
    settingsServer();
    renderApp('/settings');
    const table = await screen.findByRole('table', { name: 'Sign-ins' });
    expect(within(table).getByRole('rowheader', { name: /Morgan Avery \(you\)/ })).toBeTruthy();
    expect((within(table).getByLabelText('Role of Dana Whitlock') as HTMLSelectElement).value).toBe('helper');
    // A customer's sign-in stays a customer's: no role control for it.
    expect(within(table).queryByLabelText('Role of Jules Marchetti')).toBeNull();
  });

  it('lists the mail sent from Vanbay: what went, what waits to retry and why, filtered by where it is', async () => {
    const mail = (over: Partial<OutboxItem>): OutboxItem => ({
      id: 1,
      kind: 'invoice',
      to: 'jules@example.test',
      subject: 'Invoice 0039 from Ridgeback Mobile Moto',
      status: 'sent',
      attempts: 1,
      lastError: null,
      attachments: [{ filename: 'invoice-39.pdf', contentType: 'application/pdf', sizeBytes: 20_000 }],
      invoiceId: 39,
      jobId: null,
      sentAt: '2026-11-18T15:00:00.000Z',
      createdAt: '2026-11-18T15:00:00.000Z',
      ...over,
    });
    const sent = mail({ id: 2, attempts: 2 });
    const waiting = mail({
      id: 3,
      kind: 'reminder',
      to: 'hollis@example.test',
      subject: 'Fuel filter due',
      status: 'failed',
      attempts: 3,
      lastError: '421 Service not available',
      attachments: [],
      sentAt: null,
    });
    const asked: (string | null)[] = [];
    settingsServer({
      'GET /api/outbox': ({ url }) => {
        const status = url.searchParams.get('status');
        asked.push(status);
        const items = [waiting, sent].filter((m) => status === null || m.status === status);
        return jsonResponse(200, { items, nextCursor: null });
      },
    });
    renderApp('/settings');
    const table = await screen.findByRole('table', { name: 'Mail sent from Vanbay, newest first' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    expect(rows[0]!.textContent).toContain('Fuel filter due');
    expect(rows[0]!.textContent).toContain('Service reminder to hollis@example.test');
    expect(rows[0]!.textContent).toContain('Waiting to retry');
    expect(rows[0]!.textContent).toContain('3 tries so far');
    expect(rows[0]!.textContent).toContain('The mail server said: 421 Service not available');
    expect(rows[1]!.textContent).toContain('Sent');
    expect(rows[1]!.textContent).toContain('at the 2nd try');
    expect(rows[1]!.textContent).toContain('invoice-39.pdf');

    fireEvent.change(screen.getByLabelText('Show'), { target: { value: 'failed' } });
    await waitFor(() => expect(asked).toContain('failed'));
    await waitFor(() =>
      expect(
        within(screen.getByRole('table', { name: 'Mail sent from Vanbay, newest first' })).getAllByRole(
          'row',
        ),
      ).toHaveLength(2),
    );
  });
});
