import type { Invoice, InvoiceStatus } from '../../../../shared/api/invoices';
import { StatusPill } from '../../../components/ui/status-pill';
import type { Tone } from '../../../components/ui/tone';
import { countOf } from '../../../lib/format';

/** The same words the invoice PDF prints, so the page and the paper agree. */
export const statusWords: Record<InvoiceStatus, string> = {
  draft: 'Draft',
  issued: 'Awaiting payment',
  part_paid: 'Part paid',
  paid: 'Paid in full',
  void: 'Void',
};

const statusTones: Record<InvoiceStatus, Tone> = {
  draft: 'quiet',
  issued: 'warn',
  part_paid: 'warn',
  paid: 'pass',
  void: 'quiet',
};

/** Overdue is derived by the server (an open balance past the due date) and outranks the status. */
export function InvoiceStatusPill({
  invoice,
}: {
  invoice: Pick<Invoice, 'status' | 'overdue' | 'daysOverdue'>;
}) {
  if (invoice.overdue) {
    return <StatusPill tone="fail">{`Overdue ${countOf(invoice.daysOverdue, 'day')}`}</StatusPill>;
  }
  return <StatusPill tone={statusTones[invoice.status]}>{statusWords[invoice.status]}</StatusPill>;
}

/** Invoice numbers with at least four digits, as on the PDF: 42 → "0042". */
export function invoiceNumber(number: number): string {
  return String(number).padStart(4, '0');
}
