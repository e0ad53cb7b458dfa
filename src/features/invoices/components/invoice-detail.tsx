import { Link } from 'react-router';
import { EmptyState } from '../../../components/ui/empty-state';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { PageHeading } from '../../../components/ui/page-heading';
import { ApiError } from '../../../lib/api-client';
import { useInvoice } from '../api/queries';
import { PaymentLink, SendInvoice } from './invoice-actions';
import { InvoicePdf } from './invoice-pdf';
import { invoiceNumber } from './invoice-status';
import { InvoiceLines, InvoiceSummary, PaymentsTaken } from './invoice-summary';
import { RecordPaymentForm } from './record-payment-form';

/** What this person may do here, from the policy table (the app decides, the server enforces). */
export type InvoiceAbilities = { recordPayment: boolean; send: boolean; createLink: boolean };

type InvoiceDetailProps = {
  id: number;
  can: InvoiceAbilities;
  /** The list this invoice belongs to, for the way back. */
  listPath: string;
  listLabel: string;
};

export function InvoiceDetail({ id, can, listPath, listLabel }: InvoiceDetailProps) {
  const query = useInvoice(id);
  const back = (
    <Link
      to={listPath}
      className="inline-flex min-h-touch items-center text-lg font-bold text-coolant underline underline-offset-4"
    >
      ← {listLabel}
    </Link>
  );

  if (query.isPending) return <Loading>Loading the invoice…</Loading>;
  if (query.isError) {
    if (query.error instanceof ApiError && query.error.status === 404) {
      return (
        <>
          <PageHeading title="No such invoice" />
          <EmptyState title="This invoice is not here">
            <p>It may have been typed wrong in the address, or it is not one you can see.</p>
            <div className="mt-3">{back}</div>
          </EmptyState>
        </>
      );
    }
    return (
      <LoadFailure
        title="The invoice could not be loaded"
        error={query.error}
        onRetry={() => void query.refetch()}
        retrying={query.isFetching}
      />
    );
  }

  const invoice = query.data;
  const number = invoiceNumber(invoice.number);
  const takesPayment = invoice.status !== 'void' && (invoice.balanceCents > 0 || invoice.paidCents > 0);
  return (
    <>
      {back}
      <PageHeading title={`Invoice ${number}`}>{invoice.customerName}</PageHeading>
      <InvoiceSummary invoice={invoice} />
      <div className="mt-6 grid grid-cols-1 items-start gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="grid gap-6">
          <InvoiceLines invoice={invoice} />
          <PaymentsTaken invoice={invoice} />
        </div>
        {/* On a phone the actions come straight after the money: taking payment at the door comes first. */}
        <div className="order-first grid gap-6 xl:order-none">
          {can.recordPayment && takesPayment ? <RecordPaymentForm invoice={invoice} /> : null}
          <PaymentLink invoice={invoice} canCreate={can.createLink} />
          {can.send && invoice.status !== 'void' ? <SendInvoice invoice={invoice} /> : null}
        </div>
      </div>
      <div className="mt-6">
        <InvoicePdf id={invoice.id} number={number} />
      </div>
    </>
  );
}
