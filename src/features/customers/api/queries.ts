import { infiniteQueryOptions, queryOptions, useInfiniteQuery, useQuery } from '@tanstack/react-query';
import { CUSTOMERS_PATH, CustomerListSchema, CustomerSchema } from '../../../../shared/api/customers';
import type { Customer } from '../../../../shared/api/customers';
import { request } from '../../../lib/api-client';
import { itemsOf, listPath, nextCursorOf } from '../../../lib/cursor-list';

/** Rows per request: a screenful at the desk, few enough for the van's hotspot. */
export const CUSTOMER_PAGE_SIZE = 25;

export type CustomerFilter = {
  /** Name, e-mail or phone, any part (shared/api/customers.ts). */
  q: string;
};

export const customerPath = (id: number) => `${CUSTOMERS_PATH}/${id}`;

export const customerQueries = {
  all: () => ['customers'] as const,
  lists: () => [...customerQueries.all(), 'list'] as const,
  list: (filter: CustomerFilter) =>
    infiniteQueryOptions({
      queryKey: [...customerQueries.lists(), filter] as const,
      queryFn: ({ pageParam, signal }) =>
        request(
          listPath(CUSTOMERS_PATH, { q: filter.q.trim(), limit: CUSTOMER_PAGE_SIZE, cursor: pageParam }),
          CustomerListSchema,
          { signal },
        ),
      initialPageParam: null as string | null,
      getNextPageParam: nextCursorOf,
    }),
  details: () => [...customerQueries.all(), 'detail'] as const,
  detail: (id: number) =>
    queryOptions({
      queryKey: [...customerQueries.details(), id] as const,
      queryFn: ({ signal }): Promise<Customer> => request(customerPath(id), CustomerSchema, { signal }),
    }),
};

export function useCustomerList(filter: CustomerFilter) {
  return useInfiniteQuery({ ...customerQueries.list(filter), select: itemsOf<Customer> });
}

export function useCustomer(id: number) {
  return useQuery(customerQueries.detail(id));
}
