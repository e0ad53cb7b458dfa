// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { BusinessSettings } from '../../shared/api/business';
import type { JobDetail } from '../../shared/api/jobs';
import type { LineItem } from '../../shared/api/line-items';
import type { Role } from '../../shared/api/users';
import { fakeApi, requestedPaths, session } from './fake-api';
import type { FakeRoute } from './fake-api';
import { jsonResponse, renderApp } from './render-app';

afterEach(cleanup);

const job: JobDetail = {
  id: 7,
  status: 'diagnosing',
  customerId: 1,
  machineId: 2,
  complaint: 'Dies after ten minutes on the trail.',
  location: 'Larkspur trailhead',
  scheduledAt: '2026-11-17T16:00:00.000Z',
  arrivedAt: null,
  completedAt: null,
  cancelledAt: null,
  meterReading: 212,
  diagnosis: null,
  workDone: null,
  clientId: null,
  createdAt: '2026-11-16T10:00:00.000Z',
  updatedAt: '2026-11-16T10:00:00.000Z',
  customerName: 'Jules Marchetti',
  machineName: '2019 Norrland Fjell 450',
  events: [
    {
      id: 1,
      kind: 'status',
      fromStatus: null,
      toStatus: 'booked',
      note: null,
      actorName: 'Morgan Avery',
      at: '2026-11-16T10:00:00.000Z',
    },
  ],
};

function line(fields: Partial<LineItem> & Pick<LineItem, 'id' | 'kind' | 'description'>): LineItem {
  return {
    jobId: 7,
    partNumber: null,
    quantity: 1,
    quantityMilli: 1000,
    unitPriceCents: 0,
    markupBps: 0,
    taxable: false,
    position: fields.id,
    checkRunId: null,
    lineTotalCents: 0,
    needsPrice: false,
    createdAt: '2026-11-16T10:00:00.000Z',
    updatedAt: '2026-11-16T10:00:00.000Z',
    ...fields,
  };
}

const lines: LineItem[] = [
  line({
    id: 1,
    kind: 'labour',
    description: 'Fuel system diagnosis',
    quantity: 1.5,
    quantityMilli: 1500,
    unitPriceCents: 9500,
    lineTotalCents: 14250,
  }),
  line({
    id: 2,
    kind: 'part',
    description: 'In-tank strainer',
    unitPriceCents: 3800,
    markupBps: 2500,
    taxable: true,
    lineTotalCents: 4750,
  }),
];

const business = {
  name: 'Ridgeback Mobile Moto',
  ownerName: 'Morgan Avery',
  email: 'owner@ridgeback.test',
  phone: null,
  addressLines: [],
  timezone: 'America/Denver',
  currency: 'USD',
  labourRateCents: 9500,
  partsMarkupBps: 2500,
  tripFeeBaseCents: 0,
  tripFeePerMileCents: 0,
  tripFeeFreeMiles: 0,
  shopSuppliesBps: 0,
  taxRatePpm: 62_500,
  taxRounding: 'per_line',
  invoiceTermsDays: 14,
  invoiceFooter: null,
  updatedAt: '2026-11-01T00:00:00.000Z',
} satisfies BusinessSettings;

const empty = { items: [], nextCursor: null };

const estimate = {
  id: 31,
  jobId: 7,
  customerId: 1,
  status: 'sent',
  lines: [],
  subtotalCents: 19000,
  taxCents: 297,
  totalCents: 19297,
  taxRatePpm: 62_500,
  taxRounding: 'per_line',
  note: null,
  sentAt: '2026-11-17T17:00:00.000Z',
  decidedAt: null,
  decidedById: null,
  decidedByName: null,
  decidedVia: null,
  decisionNote: null,
  createdAt: '2026-11-17T17:00:00.000Z',
} as const;

function jobApi(role: Role, extra: Record<string, FakeRoute> = {}) {
  return fakeApi({
    ...session(role),
    'GET /api/jobs/7': () => jsonResponse(200, job),
    'GET /api/jobs/7/readings': () => jsonResponse(200, empty),
    'GET /api/jobs/7/line-items': () => jsonResponse(200, { items: lines, nextCursor: null }),
    'GET /api/jobs/7/attachments': () => jsonResponse(200, empty),
    'GET /api/business': () => jsonResponse(200, business),
    'GET /api/jobs/7/checks': () => jsonResponse(200, empty),
    'GET /api/jobs/7/estimates': () => jsonResponse(200, { items: [estimate], nextCursor: null }),
    ...extra,
  });
}

const main = () => within(screen.getByRole('main'));

describe('the job page', () => {
  it('totals the lines with the shared money code and moves the totals as a quantity is typed', async () => {
    jobApi('owner');
    renderApp('/jobs/7');
    await screen.findByRole('heading', { level: 1, name: 'Job #7 · 2019 Norrland Fjell 450' });

    // By hand: 1.5 h × $95.00 = $142.50 (not taxable); $38.00 + 25 % markup = $47.50, taxed at 6.25 %
    // = $2.96875, rounded half up to $2.97 (SSUTA §324, per line). Total $142.50 + $47.50 + $2.97.
    expect((await screen.findByTestId('subtotal')).textContent).toBe('$190.00');
    expect(screen.getByTestId('total').textContent).toBe('$192.97');

    // Two hours instead: $190.00 of labour; the tax on the part is unchanged. Nothing saved yet.
    fireEvent.change(main().getByLabelText('Quantity of Fuel system diagnosis'), { target: { value: '2' } });
    expect(screen.getByTestId('subtotal').textContent).toBe('$237.50');
    expect(screen.getByTestId('total').textContent).toBe('$240.47');
    expect(main().getByRole('button', { name: 'Save' })).toBeTruthy();

    // A quantity the server would refuse is said at once, and the totals keep the last good one.
    fireEvent.change(main().getByLabelText('Quantity of Fuel system diagnosis'), {
      target: { value: '1.2345' },
    });
    expect(main().getByText(/at most 3 decimals/)).toBeTruthy();
    expect(screen.getByTestId('total').textContent).toBe('$192.97');
  });

  it('saves an edited line with a PATCH of the typed quantity', async () => {
    let patched: unknown = null;
    const fetchMock = jobApi('owner', {
      'PATCH /api/jobs/7/line-items/1': ({ init }) => {
        patched = JSON.parse(String(init?.body));
        return jsonResponse(200, { ...lines[0], quantity: 2, quantityMilli: 2000, lineTotalCents: 19000 });
      },
    });
    renderApp('/jobs/7');
    const quantity = await screen.findByLabelText('Quantity of Fuel system diagnosis');
    fireEvent.change(quantity, { target: { value: '2' } });
    fireEvent.click(main().getByRole('button', { name: 'Save' }));
    await waitFor(() => expect(patched).toEqual({ quantity: 2, unitPriceCents: 9500 }));
    // The lines are asked again after the save (precise invalidation: the job itself is not).
    await waitFor(() =>
      expect(requestedPaths(fetchMock).filter((p) => p.startsWith('/api/jobs/7/line-items?')).length).toBe(2),
    );
    expect(requestedPaths(fetchMock).filter((p) => p === '/api/jobs/7').length).toBe(1);
  });

  it('reads a reading as typed, in the unit typed, and refuses the wrong kind of unit before sending', async () => {
    let sent: unknown = null;
    jobApi('helper', {
      'POST /api/jobs/7/readings': ({ init }) => {
        sent = JSON.parse(String(init?.body));
        return jsonResponse(201, {
          id: 90,
          jobId: 7,
          quantity: 'pressure',
          value: 296.47,
          unit: 'kPa',
          enteredValue: 43,
          enteredUnit: 'psi',
          takenAt: '2026-11-17T16:20:00.000Z',
          note: null,
          stepKey: null,
          checkRunId: null,
          clientId: null,
          judgement: { verdict: 'pass', reason: 'within 38–45 psi', specSource: 'generic', basis: 'reading' },
          createdAt: '2026-11-17T16:20:00.000Z',
        });
      },
    });
    renderApp('/jobs/7');
    const reading = await screen.findByLabelText(/^Reading/);
    fireEvent.change(reading, { target: { value: '12V' } });
    expect(main().getByText('"12V" is voltage, expected pressure')).toBeTruthy();
    expect((main().getByRole('button', { name: 'Add reading' }) as HTMLButtonElement).disabled).toBe(true);

    // 43 psi × 6.894757 kPa/psi (NIST SP 811, B.8) = 296.4746 kPa, shown to two decimals.
    fireEvent.change(reading, { target: { value: '43psi' } });
    expect(main().getByText('Stored as 296.47 kPa')).toBeTruthy();
    fireEvent.click(main().getByRole('button', { name: 'Add reading' }));
    await waitFor(() => expect(sent).toEqual({ quantity: 'pressure', value: '43psi' }));
    const saved = await main().findByText(/Saved 43 psi/);
    expect(saved.textContent).toContain('pass');
    expect(saved.textContent).toContain('within 38–45 psi');
  });

  it('shows the helper no prices to edit and the customer no workshop controls', async () => {
    jobApi('helper');
    renderApp('/jobs/7');
    await screen.findByText('In-tank strainer');
    expect(main().queryByLabelText('Quantity of Fuel system diagnosis')).toBeNull();
    expect(main().getByRole('button', { name: 'To awaiting approval' })).toBeTruthy();
    cleanup();

    jobApi('customer');
    renderApp('/jobs/7');
    await screen.findByRole('heading', { level: 1, name: 'Job #7 · 2019 Norrland Fjell 450' });
    expect(main().queryByText('In-tank strainer')).toBeNull();
    expect(main().queryByRole('button', { name: /^To / })).toBeNull();
    expect(main().queryByLabelText(/^Reading/)).toBeNull();
    expect(main().queryByLabelText('Add a note')).toBeNull();
  });

  it('lets the customer approve a sent estimate, and asks the owner how the customer answered', async () => {
    let approved: unknown = null;
    jobApi('customer', {
      'POST /api/estimates/31/approve': ({ init }) => {
        approved = JSON.parse(String(init?.body));
        return jsonResponse(200, { ...estimate, status: 'approved', decidedAt: '2026-11-17T18:00:00.000Z' });
      },
    });
    renderApp('/jobs/7');
    fireEvent.click(await screen.findByRole('button', { name: 'Approve the work' }));
    await waitFor(() => expect(approved).toEqual({}));
    expect(await screen.findByText('Answer recorded.')).toBeTruthy();
    cleanup();

    jobApi('owner');
    renderApp('/jobs/7');
    const record = await screen.findByRole('button', { name: 'Record an approval' });
    // The owner passes on the customer's word: not without saying how it was given.
    expect((record as HTMLButtonElement).disabled).toBe(true);
    fireEvent.change(main().getByLabelText(/How the customer answered/), {
      target: { value: 'Yes by phone' },
    });
    expect((record as HTMLButtonElement).disabled).toBe(false);
  });

  it('says whether the report went, or waits in the outbox with the mail server’s reason', async () => {
    const row = {
      id: 90,
      kind: 'report',
      to: 'jules@example.test',
      subject: 'Diagnostic report, job 7',
      attachments: [],
      invoiceId: null,
      jobId: 7,
      createdAt: '2026-11-18T15:00:00.000Z',
    };
    let answer: object = { ...row, status: 'failed', attempts: 1, lastError: '421 try later', sentAt: null };
    jobApi('owner', { 'POST /api/jobs/7/report/send': () => jsonResponse(202, answer) });
    renderApp('/jobs/7');
    await screen.findByRole('heading', { level: 1, name: 'Job #7 · 2019 Norrland Fjell 450' });
    fireEvent.click(await main().findByRole('button', { name: 'E-mail it to the customer' }));
    expect(
      await main().findByText(
        'Not gone yet (the mail server said: 421 try later): it is tried again on its own until it goes.',
      ),
    ).toBeTruthy();
    answer = { ...row, status: 'sent', attempts: 2, lastError: null, sentAt: '2026-11-18T15:05:00.000Z' };
    fireEvent.click(main().getByRole('button', { name: 'E-mail it to the customer' }));
    expect(await main().findByText('Report sent to jules@example.test.')).toBeTruthy();
  });

  it('says whether a new estimate’s mail went, or waits in the outbox with the mail server’s reason', async () => {
    const mail = {
      id: 91,
      kind: 'estimate',
      to: 'jules@example.test',
      subject: 'Estimate 32',
      status: 'failed',
      attempts: 1,
      lastError: '421 try later',
      attachments: [],
      invoiceId: null,
      jobId: 7,
      sentAt: null,
      createdAt: '2026-11-18T15:00:00.000Z',
    };
    jobApi('owner', {
      // None waiting for an answer yet, so a new one may be sent.
      'GET /api/jobs/7/estimates': () => jsonResponse(200, empty),
      'POST /api/jobs/7/estimate': () => jsonResponse(201, { ...estimate, id: 32, status: 'sent', mail }),
    });
    renderApp('/jobs/7');
    await screen.findByRole('heading', { level: 1, name: 'Job #7 · 2019 Norrland Fjell 450' });
    fireEvent.click(await main().findByRole('button', { name: 'Send the estimate' }));
    expect(
      await main().findByText(
        'Estimate made; its mail has not gone yet (the mail server said: 421 try later) and is tried again on its own until it goes.',
      ),
    ).toBeTruthy();
  });
});
