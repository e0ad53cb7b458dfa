import { Router } from 'express';
import { WEEK_REPORT_PATH, WeekReportQuerySchema } from '../../shared/api/reports';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { weekReport } from '../services/reports';
import type { RouteDeps } from './deps';

export function reportsRouter({ db }: RouteDeps) {
  const router = Router();
  router.get(WEEK_REPORT_PATH, allow('reports', 'read'), async (req, res) => {
    const query = parse(WeekReportQuerySchema, req.query, 'query');
    res.json(await weekReport(db, req.actor!, query));
  });
  return router;
}
