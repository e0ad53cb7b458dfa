import { QueryClientProvider } from '@tanstack/react-query';
import { configure, render } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { createQueryClient } from '../../src/app/query-client';
import { createAppRouter } from '../../src/app/router';

// A worker's first visit to a lazy route transforms its modules on demand, which can take longer
// than Testing Library's default 1 s wait; the pages themselves answer at once.
configure({ asyncUtilTimeout: 5_000 });

/**
 * The whole dashboard at `path`, with a fresh client per test (the app's own, with its 401
 * handling, but no retries) so no cached answer leaks across.
 */
export function renderApp(path = '/') {
  const queryClient = createQueryClient({ retry: false });
  const router = createAppRouter((routes) => createMemoryRouter(routes, { initialEntries: [path] }));
  const view = render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { ...view, router, queryClient };
}

export function jsonResponse(status: number, body: unknown, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json', ...headers },
  });
}

/** The router's current address, path and query. */
export function currentPath(router: ReturnType<typeof renderApp>['router']): string {
  return `${router.state.location.pathname}${router.state.location.search}`;
}
