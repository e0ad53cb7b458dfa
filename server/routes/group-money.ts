import type { Router } from 'express';
import type { RouteDeps } from './deps';

/** The routers for invoices, payments, trips, reminders, the week report and the outbox. */
export function moneyRouters(_deps: RouteDeps): Router[] {
  return [];
}
