import type { Router } from 'express';
import { backupRouter } from './backup';
import type { RouteDeps } from './deps';

/** The routers for backing up and restoring a business's whole data. */
export function backupRouters(deps: RouteDeps): Router[] {
  return [backupRouter(deps)];
}
