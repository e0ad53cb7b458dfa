import type { Router } from 'express';
import type { RouteDeps } from './deps';
import { jobsRouter } from './jobs';
import { machinesRouter } from './machines';

/** The routers for machines and jobs. */
export function workshopRouters(deps: RouteDeps): Router[] {
  return [machinesRouter(deps), jobsRouter(deps)];
}
