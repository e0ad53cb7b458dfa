import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateServiceIntervalInputSchema,
  SERVICE_INTERVAL_PATH,
  SERVICE_INTERVALS_PATH,
  ServiceIntervalListQuerySchema,
  ServiceIntervalParamsSchema,
  UpdateServiceIntervalInputSchema,
} from '../../shared/api/service-intervals';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import {
  createServiceInterval,
  deleteServiceInterval,
  listServiceIntervals,
  updateServiceInterval,
} from '../services/service-intervals';
import type { RouteDeps } from './deps';

export function serviceIntervalsRouter({ db, now }: RouteDeps) {
  const router = Router();

  router.get(SERVICE_INTERVALS_PATH, allow('serviceIntervals', 'list'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const query = parse(ServiceIntervalListQuerySchema, req.query, 'query');
    res.json(await listServiceIntervals(db, req.actor!, id, query, now()));
  });
  router.post(SERVICE_INTERVALS_PATH, allow('serviceIntervals', 'create'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(CreateServiceIntervalInputSchema, req.body);
    res.status(201).json(await createServiceInterval(db, req.actor!, id, input, now()));
  });
  router.patch(SERVICE_INTERVAL_PATH, allow('serviceIntervals', 'update'), async (req, res) => {
    const { id, intervalId } = parse(ServiceIntervalParamsSchema, req.params, 'path');
    const input = parse(UpdateServiceIntervalInputSchema, req.body);
    res.json(await updateServiceInterval(db, req.actor!, id, intervalId, input, now()));
  });
  router.delete(SERVICE_INTERVAL_PATH, allow('serviceIntervals', 'delete'), async (req, res) => {
    const { id, intervalId } = parse(ServiceIntervalParamsSchema, req.params, 'path');
    await deleteServiceInterval(db, req.actor!, id, intervalId, now());
    res.status(204).end();
  });
  return router;
}
