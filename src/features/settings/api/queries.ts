import { infiniteQueryOptions, queryOptions, useInfiniteQuery, useQuery } from '@tanstack/react-query';
import { CUSTOMERS_PATH, CustomerListSchema } from '../../../../shared/api/customers';
import { USERS_PATH } from '../../../../shared/api/users';
import { UserSchema } from '../../../../shared/api/users';
import type { User } from '../../../../shared/api/users';
import { listResponseSchema } from '../../../../shared/api/common';
import { request } from '../../../lib/api-client';
import { businessSettingsQuery } from '../../../lib/business-settings';
import { itemsOf, listPath, nextCursorOf } from '../../../lib/cursor-list';

const UserListSchema = listResponseSchema(UserSchema);

/** A one-van business has a handful of sign-ins; a page holds them all but for a big customer list. */
export const USER_PAGE_SIZE = 50;

export const settingsQueries = {
  all: () => ['settings'] as const,
  /** Shared with every feature that prices or taxes (src/lib/business-settings.ts). */
  business: businessSettingsQuery,
  users: () =>
    infiniteQueryOptions({
      queryKey: [...settingsQueries.all(), 'users'] as const,
      queryFn: ({ pageParam, signal }) =>
        request(listPath(USERS_PATH, { limit: USER_PAGE_SIZE, cursor: pageParam }), UserListSchema, {
          signal,
        }),
      initialPageParam: null as string | null,
      getNextPageParam: nextCursorOf,
    }),
  /** Customers to tie a new customer sign-in to, found by name as the owner types. */
  customerChoices: (q: string) =>
    queryOptions({
      queryKey: [...settingsQueries.all(), 'customer-choices', q] as const,
      queryFn: ({ signal }) =>
        request(listPath(CUSTOMERS_PATH, { q: q.trim(), limit: 20 }), CustomerListSchema, { signal }),
    }),
};

export function useBusinessSettings() {
  return useQuery(settingsQueries.business());
}

export function useUsers() {
  return useInfiniteQuery({ ...settingsQueries.users(), select: itemsOf<User> });
}

export function useCustomerChoices(q: string, enabled: boolean) {
  return useQuery({ ...settingsQueries.customerChoices(q), enabled });
}
