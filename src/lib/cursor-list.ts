import type { InfiniteData } from '@tanstack/react-query';
import type { ListResponse } from '../../shared/api/common';

type ParamValue = string | number | boolean | null | undefined;

/**
 * A list route's address with its filters, `limit` and `cursor` (CONTRACT.md: list routes answer
 * `{items, nextCursor}`). Empty filters are left out, so "no search" and "search for nothing" are
 * the same request and the same cache entry.
 */
export function listPath(base: string, params: Record<string, ParamValue>): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value === undefined || value === null || value === '') continue;
    search.set(key, String(value));
  }
  const query = search.toString();
  return query === '' ? base : `${base}?${query}`;
}

/** For `getNextPageParam`: the server's cursor, or no next page when it sent null. */
export function nextCursorOf(page: ListResponse<unknown>): string | null {
  return page.nextCursor;
}

/**
 * For `select`: every row fetched so far, in the server's order. A module-level function, so
 * TanStack Query keeps the same array between renders until a page arrives.
 */
export function itemsOf<Item>(data: InfiniteData<ListResponse<Item>, unknown>): Item[] {
  return data.pages.flatMap((page) => page.items);
}
