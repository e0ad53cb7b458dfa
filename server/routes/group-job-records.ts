import type { Router } from 'express';
import { checksRouter } from './checks';
import type { RouteDeps } from './deps';
import { lineItemsRouter } from './line-items';
import { readingsRouter } from './readings';

/** The routers for a job's readings, guided-check runs and line items. */
export function jobRecordRouters(deps: RouteDeps): Router[] {
  return [readingsRouter(deps), checksRouter(deps), lineItemsRouter(deps)];
}
