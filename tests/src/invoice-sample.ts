import type { Invoice, InvoiceDetail, Payment } from '../../shared/api/invoices';

/**
 * An invoice as GET /api/invoices/:id answers, in the demo scenario (PRODUCT.md). By hand:
 * labour 1 h × $95.00 = $95.00 (not taxable), a part $6.50 + 25 % markup = $8.125 → $8.13, a
 * trip $47.00 (not taxable); subtotal $150.13; tax 6.25 % of $8.13 = $0.508125 → $0.51 (SSUTA
 * §324, half up); total $150.64, nothing paid yet.
 */
export const sampleInvoice: InvoiceDetail = {
  id: 39,
  number: 39,
  customerId: 1,
  customerName: 'Jules Marchetti',
  jobId: 71,
  status: 'issued',
  issuedOn: '2026-11-14',
  dueOn: '2026-11-28',
  subtotalCents: 15_013,
  taxCents: 51,
  totalCents: 15_064,
  paidCents: 0,
  balanceCents: 15_064,
  taxRatePpm: 62_500,
  taxRounding: 'per_invoice',
  terms: 'Due within 14 days.',
  overdue: false,
  daysOverdue: 0,
  paymentLinkUrl: null,
  sentAt: null,
  voidedAt: null,
  createdAt: '2026-11-14T17:00:00.000Z',
  updatedAt: '2026-11-14T17:00:00.000Z',
  lines: [
    {
      id: 1,
      position: 0,
      kind: 'labour',
      description: 'Voltage-drop test and ground repair',
      quantityMilli: 1000,
      unitPriceCents: 9500,
      lineTotalCents: 9500,
      taxCents: 0,
    },
    {
      id: 2,
      position: 1,
      kind: 'part',
      description: 'Ring terminals and heat-shrink',
      quantityMilli: 1000,
      unitPriceCents: 650,
      lineTotalCents: 813,
      taxCents: 0,
    },
    {
      id: 3,
      position: 2,
      kind: 'trip',
      description: 'Call-out, 22.5 mi',
      quantityMilli: 1000,
      unitPriceCents: 4700,
      lineTotalCents: 4700,
      taxCents: 0,
    },
  ],
  payments: [],
};

/** The list row of an invoice (the detail without its lines and payments). */
export function listRow(invoice: InvoiceDetail): Invoice {
  const { lines: _lines, payments: _payments, ...row } = invoice;
  return row;
}

/** The invoice after a payment, as the server's recordPayment leaves it (paid, balance, status). */
export function afterPayment(invoice: InvoiceDetail, payment: Payment): InvoiceDetail {
  const paidCents = invoice.paidCents + payment.amountCents;
  return {
    ...invoice,
    paidCents,
    balanceCents: invoice.totalCents - paidCents,
    status: paidCents === 0 ? 'issued' : paidCents < invoice.totalCents ? 'part_paid' : 'paid',
    payments: [...invoice.payments, payment],
  };
}
