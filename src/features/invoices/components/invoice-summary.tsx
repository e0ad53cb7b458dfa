import type { InvoiceDetail, PaymentMethod } from '../../../../shared/api/invoices';
import type { LineItemKind } from '../../../../shared/api/jobs';
import { Panel } from '../../../components/ui/panel';
import { daysFrom, localDay, todayIso } from '../../../lib/calendar-days';
import { scaledToText } from '../../../lib/decimal-input';
import { countOf, formatCalendarDate, formatDecimal } from '../../../lib/format';
import { formatCents } from '../../../lib/money';
import { InvoiceStatusPill } from './invoice-status';

/** The money first and large: what was billed, what came in, what is still owed. */
export function InvoiceSummary({ invoice }: { invoice: InvoiceDetail }) {
  const age = daysFrom(invoice.issuedOn, todayIso());
  return (
    <section aria-labelledby="invoice-money" className="grid gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="invoice-money" className="sr-only">
          What is owed
        </h2>
        <InvoiceStatusPill invoice={invoice} />
        <p className="text-lg text-ink-soft">
          Issued {formatCalendarDate(invoice.issuedOn)}
          {age > 0 ? ` (${countOf(age, 'day')} ago)` : ' (today)'}, due {formatCalendarDate(invoice.dueOn)}
          {invoice.sentAt ? '; e-mailed to the customer' : ''}
        </p>
      </div>
      <dl className="grid grid-cols-1 gap-3 sm:grid-cols-3">
        <Figure label="Total" value={formatCents(invoice.totalCents)} />
        <Figure label="Paid" value={formatCents(invoice.paidCents)} />
        <Figure label="Balance" value={formatCents(invoice.balanceCents)} alarm={invoice.overdue} />
      </dl>
    </section>
  );
}

function Figure({ label, value, alarm = false }: { label: string; value: string; alarm?: boolean }) {
  return (
    <div
      className={`rounded-plate border-2 p-4 ${alarm ? 'border-fail bg-fail-wash text-fail' : 'border-rule bg-panel text-ink'}`}
    >
      <dt className="text-sm font-bold tracking-wider uppercase">{label}</dt>
      <dd className="mt-1 text-3xl font-bold tabular-nums" aria-live="polite">
        {value}
      </dd>
    </div>
  );
}

const kindWords: Record<LineItemKind, string> = {
  labour: 'Labour',
  part: 'Part',
  trip: 'Trip',
  supplies: 'Shop supplies',
  other: 'Other',
};

/** Thousandths as a number with up to three decimals: 1500 → "1.5". Labour reads in hours. */
function quantityText(kind: LineItemKind, quantityMilli: number): string {
  const amount = formatDecimal(quantityMilli / 1000, 3);
  return kind === 'labour' ? `${amount} h` : amount;
}

/** The lines as billed, then subtotal, tax at the rate the invoice was issued with, and total. */
export function InvoiceLines({ invoice }: { invoice: InvoiceDetail }) {
  const lines = [...invoice.lines].sort((a, b) => a.position - b.position);
  const cell = 'px-4 py-3';
  return (
    <Panel className="overflow-x-auto p-0">
      <table className="w-full border-collapse text-base">
        <caption className="px-4 pt-3 text-left text-lg font-bold">What was billed</caption>
        <thead>
          <tr className="border-b-2 border-ink">
            <th scope="col" className={`${cell} text-left`}>
              Line
            </th>
            <th scope="col" className={`${cell} text-right`}>
              Qty
            </th>
            <th scope="col" className={`${cell} text-right`}>
              Unit price
            </th>
            <th scope="col" className={`${cell} text-right`}>
              Amount
            </th>
          </tr>
        </thead>
        <tbody>
          {lines.map((line) => (
            <tr key={line.id} className="border-b border-rule align-top">
              <th scope="row" className={`${cell} text-left font-normal`}>
                <span className="block font-bold">{line.description}</span>
                <span className="text-ink-soft">{kindWords[line.kind]}</span>
              </th>
              <td className={`${cell} text-right tabular-nums`}>
                {quantityText(line.kind, line.quantityMilli)}
              </td>
              <td className={`${cell} text-right tabular-nums`}>{formatCents(line.unitPriceCents)}</td>
              <td className={`${cell} text-right tabular-nums`}>{formatCents(line.lineTotalCents)}</td>
            </tr>
          ))}
        </tbody>
        <tfoot className="tabular-nums">
          <TotalRow label="Subtotal" cents={invoice.subtotalCents} />
          <TotalRow
            label={`Tax ${scaledToText(invoice.taxRatePpm, 4, { trim: true })} %`}
            cents={invoice.taxCents}
          />
          <TotalRow label="Total" cents={invoice.totalCents} strong />
        </tfoot>
      </table>
    </Panel>
  );
}

function TotalRow({ label, cents, strong = false }: { label: string; cents: number; strong?: boolean }) {
  return (
    <tr className={strong ? 'border-t-2 border-ink text-lg font-bold' : ''}>
      <th scope="row" colSpan={3} className="px-4 py-2 text-right font-bold">
        {label}
      </th>
      <td className="px-4 py-2 text-right">{formatCents(cents)}</td>
    </tr>
  );
}

export const methodWords: Record<PaymentMethod, string> = {
  card: 'Card',
  cash: 'Cash',
  cheque: 'Cheque',
  transfer: 'Bank transfer',
};

/** Money in, oldest first as it reduced the balance; a refund shows as money out. */
export function PaymentsTaken({ invoice }: { invoice: InvoiceDetail }) {
  return (
    <Panel>
      <h2 className="text-xl font-bold">Payments</h2>
      {invoice.payments.length === 0 ? (
        <p className="mt-2 text-lg text-ink-soft">
          {invoice.status === 'void'
            ? 'This invoice is void and takes no payments.'
            : 'Nothing has been paid yet.'}
        </p>
      ) : (
        <ul className="mt-3 grid gap-2">
          {invoice.payments.map((payment) => (
            <li
              key={payment.id}
              className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 border-b border-rule pb-2 last:border-b-0"
            >
              <span>
                <span className="font-bold">{methodWords[payment.method]}</span>
                <span className="text-ink-soft">
                  {' '}
                  · {formatCalendarDate(localDay(payment.receivedAt))}
                  {payment.reference ? ` · ${payment.reference}` : ''}
                </span>
              </span>
              <span className="text-lg font-bold tabular-nums">
                {payment.amountCents < 0
                  ? `${formatCents(-payment.amountCents)} refunded`
                  : formatCents(payment.amountCents)}
              </span>
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}
