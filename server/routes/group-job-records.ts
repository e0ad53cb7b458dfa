import type { Router } from 'express';
import type { RouteDeps } from './deps';

/** The routers for a job's readings, checks, line items and attachments. */
export function jobRecordRouters(_deps: RouteDeps): Router[] {
  return [];
}
