import type { Router } from 'express';
import type { RouteDeps } from './deps';
import { invoicesRouter } from './invoices';
import { outboxRouter } from './outbox';
import { paymentLinkRouter } from './payment-link';
import { paymentsRouter } from './payments';
import { reportsRouter } from './reports';
import { tripsRouter } from './trips';

/**
 * The routers for invoices, payments (and card links), trips, the week report and the outbox.
 * The payment service's webhook is not here: app.ts mounts it ahead of the JSON parser and the
 * session check (routes/payment-webhook.ts).
 */
export function moneyRouters(deps: RouteDeps): Router[] {
  return [
    invoicesRouter(deps),
    paymentsRouter(deps),
    paymentLinkRouter(deps),
    tripsRouter(deps),
    reportsRouter(deps),
    outboxRouter(deps),
  ];
}
