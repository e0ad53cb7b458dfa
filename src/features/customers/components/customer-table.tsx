import { useMemo } from 'react';
import type { ReactNode } from 'react';
import { Link } from 'react-router';
import type { Customer } from '../../../../shared/api/customers';
import { dataColumns, DataTable } from '../../../components/ui/data-table';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { useCustomerList } from '../api/queries';
import type { CustomerFilter } from '../api/queries';

const col = dataColumns<Customer>();

type CustomerTableProps = {
  filter: CustomerFilter;
  customerHref: (id: number) => string;
  empty: ReactNode;
};

/** Customers a page at a time, newest first, each linked to their record. */
export function CustomerTable({ filter, customerHref, empty }: CustomerTableProps) {
  const customers = useCustomerList(filter);
  const columns = useMemo(
    () =>
      col.columns([
        col.accessor('name', {
          header: 'Name',
          meta: { rowHeader: true },
          cell: ({ row }) => (
            <Link
              to={customerHref(row.original.id)}
              className="font-bold text-coolant underline underline-offset-4"
            >
              {row.original.name}
            </Link>
          ),
        }),
        col.accessor((customer) => customer.phone ?? '', {
          id: 'phone',
          header: 'Phone',
          cell: ({ row }) =>
            row.original.phone ? (
              <a
                href={`tel:${row.original.phone}`}
                className="whitespace-nowrap underline underline-offset-4"
              >
                {row.original.phone}
              </a>
            ) : (
              <span className="text-ink-soft">—</span>
            ),
        }),
        col.accessor((customer) => customer.email ?? '', {
          id: 'email',
          header: 'E-mail',
          cell: ({ row }) =>
            row.original.email ? (
              <span className="break-all">{row.original.email}</span>
            ) : (
              <span className="text-ink-soft">none: no reminders by mail</span>
            ),
        }),
        col.accessor((customer) => customer.town ?? '', {
          id: 'town',
          header: 'Town',
          meta: { hideOnPhone: true },
        }),
      ]),
    [customerHref],
  );

  if (customers.isPending) return <Loading>Loading the customers…</Loading>;
  if (customers.isError) {
    return (
      <LoadFailure
        title="The customers could not be loaded"
        error={customers.error}
        onRetry={() => void customers.refetch()}
        retrying={customers.isFetching}
      />
    );
  }
  return (
    <DataTable
      caption="Customers"
      hideCaption
      columns={columns}
      rows={customers.data}
      getRowId={(customer) => String(customer.id)}
      paging={customers}
      moreLabel="Show more customers"
      empty={empty}
    />
  );
}
