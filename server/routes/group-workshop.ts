import type { Router } from 'express';
import type { RouteDeps } from './deps';

/** The routers for machines and jobs. */
export function workshopRouters(_deps: RouteDeps): Router[] {
  return [];
}
