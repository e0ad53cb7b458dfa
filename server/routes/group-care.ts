import type { Router } from 'express';
import type { RouteDeps } from './deps';

/** The routers for attachments, machines' service intervals and service reminders. */
export function careRouters(_deps: RouteDeps): Router[] {
  return [];
}
