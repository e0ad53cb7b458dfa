// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { CreatePaymentInput, InvoiceDetail, Payment } from '../../shared/api/invoices';
import type { Role } from '../../shared/api/users';
import { fakeApi, requestedPaths, session } from './fake-api';
import type { FakeRoute } from './fake-api';
import { afterPayment, listRow, sampleInvoice } from './invoice-sample';
import { jsonResponse, renderApp } from './render-app';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const main = () => within(screen.getByRole('main'));

/**
 * A fake server holding one invoice: GET answers it as it stands, POST payments applies the
 * payment (or answers `refuse` when given), so the page's refetch after a payment sees the change.
 */
function invoiceServer(
  role: Role,
  start: InvoiceDetail = sampleInvoice,
  extra: Record<string, FakeRoute> = {},
) {
  let invoice = start;
  const payments: CreatePaymentInput[] = [];
  const fetchMock = fakeApi({
    ...session(role),
    [`GET /api/invoices/${start.id}`]: () => jsonResponse(200, invoice),
    'GET /api/invoices': () => jsonResponse(200, { items: [listRow(invoice)], nextCursor: null }),
    [`POST /api/invoices/${start.id}/payments`]: ({ init }) => {
      const input = JSON.parse(String(init?.body)) as CreatePaymentInput;
      payments.push(input);
      const payment: Payment = {
        id: 500 + payments.length,
        invoiceId: invoice.id,
        method: input.method,
        amountCents: input.amountCents,
        receivedAt: input.receivedAt ?? '2026-11-18T15:00:00.000Z',
        reference: input.reference ?? null,
        recordedBy: 1,
        createdAt: '2026-11-18T15:00:00.000Z',
      };
      invoice = afterPayment(invoice, payment);
      return jsonResponse(201, { payment, invoice: listRow(invoice) });
    },
    ...extra,
  });
  return { fetchMock, payments };
}

async function openInvoice(id = sampleInvoice.id) {
  renderApp(`/invoices/${id}`);
  await screen.findByRole('heading', { level: 1, name: 'Invoice 0039' });
}

/** The figure in the invoice's summary tiles under `label`. */
const figure = (label: string) => main().getByText(label, { selector: 'dt' }).nextElementSibling?.textContent;

function paymentForm() {
  return within(screen.getByRole('form', { name: 'Record a payment' }));
}

function typeAmount(text: string) {
  fireEvent.change(paymentForm().getByLabelText(/^Amount/), { target: { value: text } });
}

describe('the invoice page', () => {
  it('shows the invoice’s lines and money as the API sends them', async () => {
    invoiceServer('owner');
    await openInvoice();

    expect(figure('Total')).toBe('$150.64');
    expect(figure('Paid')).toBe('$0.00');
    expect(figure('Balance')).toBe('$150.64');
    const lines = within(main().getByRole('table', { name: 'What was billed' }));
    // Cents to dollars by hand: 813 ¢ = $8.13, 15 013 ¢ = $150.13; 62 500 ppm = 6.25 %.
    expect(lines.getByRole('rowheader', { name: /Ring terminals/ }).parentElement?.textContent).toContain(
      '$8.13',
    );
    expect(lines.getByRole('rowheader', { name: 'Subtotal' }).nextElementSibling?.textContent).toBe(
      '$150.13',
    );
    expect(lines.getByRole('rowheader', { name: 'Tax 6.25 %' }).nextElementSibling?.textContent).toBe(
      '$0.51',
    );
    expect(main().getByRole('link', { name: 'Download the PDF' }).getAttribute('href')).toBe(
      '/api/invoices/39/pdf',
    );
  });

  it('records a payment typed in dollars as whole cents and shows the balance the server answers', async () => {
    const { payments } = invoiceServer('owner');
    await openInvoice();

    // The amount starts at the whole balance, 15 064 ¢ = 150.64.
    expect((paymentForm().getByLabelText(/^Amount/) as HTMLInputElement).value).toBe('150.64');
    fireEvent.click(paymentForm().getByLabelText('Cheque'));
    typeAmount('$40.1');
    fireEvent.change(paymentForm().getByLabelText(/^Reference/), { target: { value: ' 1047 ' } });
    fireEvent.click(paymentForm().getByRole('button', { name: 'Record the payment' }));

    await paymentForm().findByText(/\$40\.10 cheque recorded\. Balance now \$110\.54\./);
    // "$40.1" is 40.10 dollars = 4 010 cents (by hand); the day left as today sends no receivedAt.
    expect(payments).toEqual([{ method: 'cheque', amountCents: 4010, reference: '1047' }]);
    // 15 064 − 4 010 = 11 054 ¢ (by hand), as the fake server computed and answered it.
    await waitFor(() => expect(figure('Balance')).toBe('$110.54'));
    expect(figure('Paid')).toBe('$40.10');
    expect(
      within(main().getByRole('heading', { name: 'Payments' }).parentElement!).getByText('$40.10'),
    ).toBeTruthy();
    // The form starts again from the new balance.
    expect((paymentForm().getByLabelText(/^Amount/) as HTMLInputElement).value).toBe('110.54');
  });

  it.each([
    ['', 'The amount is not a number: type it like 45.50'],
    ['forty', 'The amount is not a number: type it like 45.50'],
    ['12.345', 'The amount takes at most 2 decimals: type it like 45.50'],
    ['1,23.00', 'The amount is not a number: type it like 45.50'],
    ['-5', 'The amount cannot be negative: type it like 45.50'],
    ['0.00', 'An amount of 0 records nothing'],
    ['150.65', 'That is more than the $150.64 left to pay'],
  ])('refuses the amount %j beside the field and sends nothing', async (typed, message) => {
    const { fetchMock, payments } = invoiceServer('owner');
    await openInvoice();

    typeAmount(typed);
    fireEvent.click(paymentForm().getByRole('button', { name: 'Record the payment' }));

    const field = paymentForm().getByLabelText(/^Amount/);
    await waitFor(() => expect(field.getAttribute('aria-invalid')).toBe('true'));
    expect(paymentForm().getByText(message)).toBeTruthy();
    expect(payments).toEqual([]);
    expect(requestedPaths(fetchMock).filter((path) => path.endsWith('/payments'))).toEqual([]);
  });

  it('shows the server’s refusal and leaves the balance as it was', async () => {
    invoiceServer('owner', sampleInvoice, {
      'POST /api/invoices/39/payments': () =>
        jsonResponse(409, {
          error: { code: 'conflict', message: 'Invoice 39 is void: it takes no payments.' },
        }),
    });
    await openInvoice();

    typeAmount('20');
    fireEvent.click(paymentForm().getByRole('button', { name: 'Record the payment' }));

    const alert = await paymentForm().findByRole('alert');
    expect(alert.textContent).toContain(
      'The payment was not recorded. Invoice 39 is void: it takes no payments.',
    );
    expect(figure('Balance')).toBe('$150.64');
  });

  it('takes a refund of at most what was paid, sent as a negative amount', async () => {
    const paid = afterPayment(sampleInvoice, {
      id: 400,
      invoiceId: 39,
      method: 'cash',
      amountCents: 5000,
      receivedAt: '2026-11-15T18:00:00.000Z',
      reference: null,
      recordedBy: 1,
      createdAt: '2026-11-15T18:00:00.000Z',
    });
    const { payments } = invoiceServer('owner', paid);
    await openInvoice();

    fireEvent.click(paymentForm().getByLabelText(/This is a refund/));
    typeAmount('50.01');
    fireEvent.click(paymentForm().getByRole('button', { name: 'Record the refund' }));
    expect(await paymentForm().findByText('A refund can be at most the $50.00 paid so far')).toBeTruthy();

    typeAmount('12.5');
    fireEvent.click(paymentForm().getByRole('button', { name: 'Record the refund' }));
    await paymentForm().findByText(/Refund of \$12\.50 recorded\. Balance now \$113\.14\./);
    // 12.50 dollars = 1 250 cents, refunded; 15 064 − (5 000 − 1 250) = 11 314 ¢ (by hand).
    expect(payments).toEqual([{ method: 'cash', amountCents: -1250, reference: null }]);
  });

  it('gives the owner a send control and a way to make a card link, and says when links are not set up', async () => {
    invoiceServer('owner', sampleInvoice, {
      'POST /api/invoices/39/payment-link': () =>
        jsonResponse(503, {
          error: { code: 'payments_not_configured', message: 'Card payments are not set up on this server.' },
        }),
    });
    await openInvoice();

    expect(main().getByRole('button', { name: 'Send the invoice' })).toBeTruthy();
    fireEvent.click(main().getByRole('button', { name: 'Make a payment link' }));
    const alert = await main().findByRole('alert');
    expect(alert.textContent).toContain(
      'Card links are not available: Card payments are not set up on this server.',
    );
  });

  it('says a mail already waiting in the outbox is retried on its own, and tries it at once when asked', async () => {
    const sends: string[] = [];
    const mail = {
      id: 71,
      kind: 'invoice',
      to: 'jules@example.test',
      subject: 'Invoice 0039',
      status: 'sent' as const,
      attempts: 2,
      lastError: null,
      attachments: [],
      invoiceId: 39,
      jobId: null,
      sentAt: '2026-11-18T15:00:00.000Z',
      createdAt: '2026-11-18T14:00:00.000Z',
      paymentLinkUrl: null,
      paymentLinkError: null,
    };
    invoiceServer('owner', sampleInvoice, {
      'POST /api/invoices/39/send': ({ url }) => {
        sends.push(url.search);
        return url.searchParams.get('again') === 'true'
          ? jsonResponse(202, mail)
          : jsonResponse(409, {
              error: {
                code: 'conflict',
                message:
                  'Invoice 0039 is waiting in the outbox and is tried again on its own; send it again to try it now.',
                details: { mailIds: [71], waiting: true },
              },
            });
      },
    });
    await openInvoice();
    fireEvent.click(main().getByRole('button', { name: 'Send the invoice' }));
    expect(await main().findByText(/is waiting in the outbox and is tried again on its own/)).toBeTruthy();
    fireEvent.click(main().getByRole('button', { name: 'Try it now' }));
    expect(await main().findByText('Sent to jules@example.test.')).toBeTruthy();
    expect(sends).toEqual(['', '?again=true']);
    expect(main().queryByRole('button', { name: 'Try it now' })).toBeNull();
  });

  it('shows a customer their invoice and its payment link, with no payment or send controls', async () => {
    const withLink = { ...sampleInvoice, paymentLinkUrl: 'http://127.0.0.1:5199/pay/cs_test_39' };
    invoiceServer('customer', withLink);
    await openInvoice();

    expect(main().getByRole('link', { name: '← Your invoices' })).toBeTruthy();
    expect(screen.queryByRole('form', { name: 'Record a payment' })).toBeNull();
    expect(main().queryByRole('button', { name: /send/i })).toBeNull();
    expect(main().queryByRole('button', { name: 'Make a payment link' })).toBeNull();
    expect(main().getByRole('link', { name: 'Open the payment page' }).getAttribute('href')).toBe(
      withLink.paymentLinkUrl,
    );
    expect(main().getByRole('link', { name: 'Download the PDF' })).toBeTruthy();
  });
});

describe('the invoice list', () => {
  it('is "Your invoices" for a customer, without the customer column', async () => {
    invoiceServer('customer');
    renderApp('/invoices');

    await screen.findByRole('heading', { level: 1, name: 'Your invoices' });
    const table = await main().findByRole('table', { name: 'Your invoices, newest first' });
    expect(within(table).queryByText('Jules Marchetti')).toBeNull();
    expect(within(table).getByRole('link', { name: '0039' }).getAttribute('href')).toBe('/invoices/39');
  });

  it('asks the API for the view picked: unpaid is an open balance, overdue is the derived status', async () => {
    const { fetchMock } = invoiceServer('bookkeeper');
    renderApp('/invoices?show=unpaid');
    await screen.findByRole('heading', { level: 1, name: 'Invoices' });
    await main().findByRole('table', { name: 'Invoices, newest first' });
    fireEvent.click(main().getByRole('link', { name: 'Overdue' }));
    await waitFor(() =>
      expect(requestedPaths(fetchMock).filter((path) => path.startsWith('/api/invoices'))).toEqual([
        '/api/invoices?unpaid=true&limit=25',
        '/api/invoices?status=overdue&limit=25',
      ]),
    );
  });

  it('says what to do next when there are no invoices', async () => {
    invoiceServer('owner', sampleInvoice, {
      'GET /api/invoices': () => jsonResponse(200, { items: [], nextCursor: null }),
    });
    renderApp('/invoices');
    await screen.findByRole('heading', { level: 1, name: 'Invoices' });
    expect(await main().findByText('No invoices yet')).toBeTruthy();
    expect(main().getByText('vanbay invoice create JOB')).toBeTruthy();
  });
});
