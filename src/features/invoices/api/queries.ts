import { infiniteQueryOptions, queryOptions, useInfiniteQuery, useQuery } from '@tanstack/react-query';
import {
  InvoiceDetailSchema,
  InvoiceListSchema,
  invoicePath,
  INVOICES_PATH,
} from '../../../../shared/api/invoices';
import type { Invoice, InvoiceDetail, InvoiceListQuery } from '../../../../shared/api/invoices';
import { request } from '../../../lib/api-client';
import { itemsOf, listPath, nextCursorOf } from '../../../lib/cursor-list';

/** What a list asks for besides its cursor and page size. */
export type InvoiceFilter = Omit<InvoiceListQuery, 'cursor' | 'limit'>;

/** A screenful at the desk, few enough for the van's hotspot. */
export const INVOICE_PAGE_SIZE = 25;

/** Keys from general to specific (STYLE.md): a payment invalidates `lists()` and its own `detail(id)`. */
export const invoiceQueries = {
  all: () => ['invoices'] as const,
  lists: () => [...invoiceQueries.all(), 'list'] as const,
  list: (filter: InvoiceFilter) =>
    infiniteQueryOptions({
      queryKey: [...invoiceQueries.lists(), filter] as const,
      queryFn: ({ pageParam, signal }) =>
        request(
          listPath(INVOICES_PATH, { ...filter, limit: INVOICE_PAGE_SIZE, cursor: pageParam }),
          InvoiceListSchema,
          { signal },
        ),
      initialPageParam: null as string | null,
      getNextPageParam: nextCursorOf,
    }),
  details: () => [...invoiceQueries.all(), 'detail'] as const,
  detail: (id: number) =>
    queryOptions({
      queryKey: [...invoiceQueries.details(), id] as const,
      queryFn: ({ signal }): Promise<InvoiceDetail> =>
        request(invoicePath(id), InvoiceDetailSchema, { signal }),
    }),
};

export function useInvoiceList(filter: InvoiceFilter) {
  return useInfiniteQuery({ ...invoiceQueries.list(filter), select: itemsOf<Invoice> });
}

export function useInvoice(id: number) {
  return useQuery(invoiceQueries.detail(id));
}

/** The PDF's address; the session cookie goes along, so a frame or a plain link can open it. */
export const invoicePdfPath = (id: number) => `${invoicePath(id)}/pdf`;
