import { useSearchParams } from 'react-router';
import { isAllowed } from '../../../shared/api/policy';
import { PageHeading } from '../../components/ui/page-heading';
import { InvoiceList, isInvoiceView } from '../../features/invoices/components/invoice-list';
import { InvoiceViews } from '../../features/invoices/components/invoice-views';
import { useSessionUser } from '../../features/session/api/queries';
import { labelOf } from '../layout/sections';
import { paths, pathTo } from '../paths';

/** Invoices with their status and age; a customer's own only, under "Your invoices". */
export function Component() {
  const { role } = useSessionUser();
  const [search] = useSearchParams();
  const shown = search.get('show');
  const view = isInvoiceView(shown) ? shown : 'all';
  const forCustomer = role === 'customer';
  return (
    <>
      <PageHeading title={labelOf(paths.invoices, role)}>
        {forCustomer
          ? 'What was billed for work on your machines, what you have paid and what is left. Open one to see its PDF or pay it.'
          : isAllowed(role, 'payments', 'create')
            ? 'Open an invoice to see its PDF, send it, take a payment or make a card link.'
            : 'Open an invoice to see its PDF and the payments taken.'}
      </PageHeading>
      <div className="mb-6">
        <InvoiceViews view={view} />
      </div>
      <InvoiceList view={view} linkTo={pathTo.invoice} forCustomer={forCustomer} />
    </>
  );
}
