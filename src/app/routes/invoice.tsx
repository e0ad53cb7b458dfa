import { useParams } from 'react-router';
import { IdSchema } from '../../../shared/api/common';
import { isAllowed } from '../../../shared/api/policy';
import { EmptyState } from '../../components/ui/empty-state';
import { PageHeading } from '../../components/ui/page-heading';
import { InvoiceDetail } from '../../features/invoices/components/invoice-detail';
import { useSessionUser } from '../../features/session/api/queries';
import { labelOf } from '../layout/sections';
import { paths } from '../paths';

/** One invoice: the money, the lines, the payments, the PDF, and what this role may do with it. */
export function Component() {
  const { role } = useSessionUser();
  const id = IdSchema.safeParse(useParams().invoiceId);
  if (!id.success) {
    return (
      <>
        <PageHeading title="No such invoice" />
        <EmptyState title="That address names no invoice">
          <p>Pick the invoice from the list instead.</p>
        </EmptyState>
      </>
    );
  }
  return (
    <InvoiceDetail
      key={id.data}
      id={id.data}
      listPath={paths.invoices}
      listLabel={labelOf(paths.invoices, role)}
      can={{
        recordPayment: isAllowed(role, 'payments', 'create'),
        // Sending and card links change the invoice: the invoices `update` row (server/routes/invoice-send.ts).
        send: isAllowed(role, 'invoices', 'update'),
        createLink: isAllowed(role, 'invoices', 'update'),
      }}
    />
  );
}
