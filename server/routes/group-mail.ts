import type { Router } from 'express';
import type { RouteDeps } from './deps';
import { invoiceSendRouter, reminderSendRouter } from './invoice-send';

/** The routes that send mail: an invoice with its PDF, a service reminder. */
export function mailRouters(deps: RouteDeps): Router[] {
  return [invoiceSendRouter(deps), reminderSendRouter(deps)];
}
