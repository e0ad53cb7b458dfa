import { createBrowserRouter } from 'react-router';
import type { DataRouter, RouteObject } from 'react-router';
import { AppFrame } from './layout/app-frame';
import { PageLoading } from './layout/page-loading';
import { RouteError } from './layout/route-error';
import { SessionChecking } from './layout/session-states';
import { paths } from './paths';

/**
 * The session check loads eagerly, so /me is asked at once. The signed-in frame and each page, "/"
 * too, are chunks of their own, fetched together while /me is asked, and a page only when first
 * visited, so the phone on the van's hotspot downloads only what it opens (the week page's chart
 * library, above all, comes only with the week page).
 */
export const routes: RouteObject[] = [
  {
    path: paths.signIn,
    ErrorBoundary: RouteError,
    HydrateFallback: PageLoading,
    lazy: () => import('./routes/sign-in'),
  },
  {
    path: paths.home,
    Component: AppFrame,
    ErrorBoundary: RouteError,
    children: [
      {
        // The header and navigation: fetched while /me is asked, beside the page's own code.
        lazy: () => import('./layout/signed-in-frame'),
        HydrateFallback: SessionChecking,
        children: [
          {
            // A failing page is caught inside the frame, so the header and navigation stay usable.
            ErrorBoundary: RouteError,
            HydrateFallback: PageLoading,
            children: [
              { index: true, lazy: () => import('./routes/home') },
              { path: paths.week, lazy: () => import('./routes/week') },
              { path: paths.jobs, lazy: () => import('./routes/jobs') },
              { path: paths.job, lazy: () => import('./routes/job') },
              { path: paths.checkRun, lazy: () => import('./routes/check-run') },
              { path: paths.customers, lazy: () => import('./routes/customers') },
              { path: paths.customer, lazy: () => import('./routes/customer') },
              { path: paths.machine, lazy: () => import('./routes/machine') },
              { path: paths.invoices, lazy: () => import('./routes/invoices') },
              { path: paths.invoice, lazy: () => import('./routes/invoice') },
              { path: paths.mileage, lazy: () => import('./routes/mileage') },
              { path: paths.reminders, lazy: () => import('./routes/reminders') },
              { path: paths.settings, lazy: () => import('./routes/settings') },
              { path: '*', lazy: () => import('./routes/not-found') },
            ],
          },
        ],
      },
    ],
  },
];

export type RouterFactory = (routes: RouteObject[]) => DataRouter;

/** Tests pass `createMemoryRouter`; the app uses the browser's history. */
export function createAppRouter(createRouter: RouterFactory = createBrowserRouter): DataRouter {
  return createRouter(routes);
}
