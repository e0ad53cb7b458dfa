/**
 * Every resource router, in one list for app.ts. Each group file is owned by the part of the API
 * it serves, so work on one resource does not touch another's wiring.
 */
import type { Router } from 'express';
import { backupRouters } from './group-backup';
import { businessRouter } from './business';
import { customersRouter } from './customers';
import { careRouters } from './group-care';
import type { RouteDeps } from './deps';
import { documentRouters } from './group-documents';
import { jobRecordRouters } from './group-job-records';
import { mailRouters } from './group-mail';
import { moneyRouters } from './group-money';
import { usersRouter } from './users';
import { workshopRouters } from './group-workshop';

export function apiRouters(deps: RouteDeps): Router[] {
  return [
    customersRouter(deps),
    usersRouter(deps),
    ...workshopRouters(deps),
    ...jobRecordRouters(deps),
    ...moneyRouters(deps),
    ...careRouters(deps),
    ...backupRouters(deps),
    ...mailRouters(deps),
    ...documentRouters(deps),
    businessRouter(deps),
  ];
}
