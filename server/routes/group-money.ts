import type { Router } from 'express';
import type { RouteDeps } from './deps';
import { invoicesRouter } from './invoices';
import { outboxRouter } from './outbox';
import { paymentsRouter } from './payments';
import { reportsRouter } from './reports';
import { tripsRouter } from './trips';

/** The routers for invoices, payments, trips, the week report and the outbox. */
export function moneyRouters(deps: RouteDeps): Router[] {
  return [
    invoicesRouter(deps),
    paymentsRouter(deps),
    tripsRouter(deps),
    reportsRouter(deps),
    outboxRouter(deps),
  ];
}
