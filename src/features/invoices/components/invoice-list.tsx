import { useMemo } from 'react';
import { Link } from 'react-router';
import type { Invoice } from '../../../../shared/api/invoices';
import { DataTable, dataColumns } from '../../../components/ui/data-table';
import type { DataColumns } from '../../../components/ui/data-table';
import { EmptyState } from '../../../components/ui/empty-state';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { daysFrom, todayIso } from '../../../lib/calendar-days';
import { countOf, formatCalendarDate } from '../../../lib/format';
import { formatCents } from '../../../lib/money';
import { useInvoiceList } from '../api/queries';
import type { InvoiceFilter } from '../api/queries';
import { InvoiceStatusPill, invoiceNumber } from './invoice-status';

/** The list's views, each one API filter. */
export const INVOICE_VIEWS = {
  all: { label: 'All', filter: {} },
  unpaid: { label: 'Unpaid', filter: { unpaid: 'true' } },
  overdue: { label: 'Overdue', filter: { status: 'overdue' } },
  paid: { label: 'Paid', filter: { status: 'paid' } },
} as const satisfies Record<string, { label: string; filter: InvoiceFilter }>;
export type InvoiceView = keyof typeof INVOICE_VIEWS;

export function isInvoiceView(value: string | null): value is InvoiceView {
  return value !== null && Object.hasOwn(INVOICE_VIEWS, value);
}

type InvoiceListProps = {
  view: InvoiceView;
  /** The page of one invoice; the app owns the addresses. */
  linkTo: (id: number) => string;
  /** A customer sees only their own invoices, so the customer column says nothing to them. */
  forCustomer: boolean;
};

const column = dataColumns<Invoice>();

function columnsFor(
  linkTo: (id: number) => string,
  forCustomer: boolean,
  today: string,
): DataColumns<Invoice> {
  return [
    column.accessor('number', {
      header: 'Invoice',
      meta: { rowHeader: true },
      cell: ({ row }) => (
        <>
          <Link
            to={linkTo(row.original.id)}
            className="inline-flex min-h-touch items-center text-lg font-bold text-coolant underline underline-offset-4"
          >
            {invoiceNumber(row.original.number)}
          </Link>
          {forCustomer ? null : <span className="block text-ink-soft">{row.original.customerName}</span>}
        </>
      ),
    }),
    column.accessor('issuedOn', {
      header: 'Issued',
      cell: ({ getValue }) => <IssuedAge issuedOn={getValue()} today={today} />,
    }),
    column.accessor('dueOn', {
      header: 'Due',
      cell: ({ getValue }) => <span className="whitespace-nowrap">{formatCalendarDate(getValue())}</span>,
    }),
    column.display({
      id: 'status',
      header: 'Status',
      cell: ({ row }) => <InvoiceStatusPill invoice={row.original} />,
    }),
    column.accessor('totalCents', {
      header: 'Total',
      meta: { align: 'end' },
      cell: ({ getValue }) => formatCents(getValue()),
    }),
    column.accessor('balanceCents', {
      header: 'Balance',
      meta: { align: 'end' },
      cell: ({ getValue }) => (
        <span className={getValue() > 0 ? 'font-bold' : 'text-ink-soft'}>{formatCents(getValue())}</span>
      ),
    }),
  ];
}

/** The issue day and how long ago it was: the age is what a desk review of unpaid work goes by. */
function IssuedAge({ issuedOn, today }: { issuedOn: string; today: string }) {
  const age = daysFrom(issuedOn, today);
  return (
    <>
      <span className="block whitespace-nowrap">{formatCalendarDate(issuedOn)}</span>
      <span className="block text-ink-soft">{age <= 0 ? 'today' : `${countOf(age, 'day')} ago`}</span>
    </>
  );
}

export function InvoiceList({ view, linkTo, forCustomer }: InvoiceListProps) {
  const list = useInvoiceList(INVOICE_VIEWS[view].filter);
  const today = todayIso();
  const columns = useMemo(() => columnsFor(linkTo, forCustomer, today), [linkTo, forCustomer, today]);

  if (list.isPending) return <Loading>Loading invoices…</Loading>;
  if (list.isError && !list.data) {
    return (
      <LoadFailure
        title="The invoices could not be loaded"
        error={list.error}
        onRetry={() => void list.refetch()}
        retrying={list.isFetching}
      />
    );
  }
  return (
    <DataTable
      caption={forCustomer ? 'Your invoices, newest first' : 'Invoices, newest first'}
      columns={columns}
      rows={list.data}
      getRowId={(invoice) => String(invoice.id)}
      paging={list}
      moreLabel="Show more invoices"
      empty={<NoInvoices view={view} forCustomer={forCustomer} />}
    />
  );
}

function NoInvoices({ view, forCustomer }: { view: InvoiceView; forCustomer: boolean }) {
  if (forCustomer) {
    return (
      <EmptyState
        title={view === 'all' ? 'No invoices yet' : `No ${INVOICE_VIEWS[view].label.toLowerCase()} invoices`}
      >
        <p>When work on one of your machines is billed, its invoice shows here, with a way to pay it.</p>
      </EmptyState>
    );
  }
  const next: Record<InvoiceView, string> = {
    all: 'An invoice is issued from a complete job: finish the job, then bill it from its page or from the van with',
    unpaid:
      'Every invoice is paid up. New ones land here until their balance is paid; bill a complete job with',
    overdue: 'Nothing is past its due date. To bill a complete job, use',
    paid: 'No invoice is paid in full yet. Record a payment on an invoice’s page; to bill a job, use',
  };
  return (
    <EmptyState
      title={view === 'all' ? 'No invoices yet' : `No ${INVOICE_VIEWS[view].label.toLowerCase()} invoices`}
    >
      <p>
        {next[view]} <code className="font-mono font-bold">vanbay invoice create JOB</code>.
      </p>
    </EmptyState>
  );
}
