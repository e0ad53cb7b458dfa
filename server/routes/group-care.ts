import type { Router } from 'express';
import { attachmentsRouter } from './attachments';
import type { RouteDeps } from './deps';
import { remindersRouter } from './reminders';
import { serviceIntervalsRouter } from './service-intervals';

/** The routers for attachments, machines' service intervals and service reminders. */
export function careRouters(deps: RouteDeps): Router[] {
  return [attachmentsRouter(deps), serviceIntervalsRouter(deps), remindersRouter(deps)];
}
