import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateTripInputSchema,
  TRIPS_EXPORT_PATH,
  TRIPS_PATH,
  TRIPS_SUMMARY_PATH,
  TripExportQuerySchema,
  TripListQuerySchema,
  TripSummaryQuerySchema,
  UpdateTripInputSchema,
} from '../../shared/api/trips';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import {
  createTrip,
  deleteTrip,
  exportTripsCsv,
  getTrip,
  listTrips,
  tripSummary,
  updateTrip,
} from '../services/trips';
import type { RouteDeps } from './deps';

export function tripsRouter({ db, now }: RouteDeps) {
  const router = Router();
  const one = `${TRIPS_PATH}/:id`;

  router.get(TRIPS_PATH, allow('trips', 'list'), async (req, res) => {
    const query = parse(TripListQuerySchema, req.query, 'query');
    res.json(await listTrips(db, req.actor!, query));
  });
  // Before `/:id`, which would otherwise take "summary" and "export.csv" for ids.
  router.get(TRIPS_SUMMARY_PATH, allow('trips', 'list'), async (req, res) => {
    const { year } = parse(TripSummaryQuerySchema, req.query, 'query');
    res.json(await tripSummary(db, req.actor!, year));
  });
  router.get(TRIPS_EXPORT_PATH, allow('trips', 'list'), async (req, res) => {
    const query = parse(TripExportQuerySchema, req.query, 'query');
    const { filename, csv } = await exportTripsCsv(db, req.actor!, query);
    res.type('text/csv; charset=utf-8').attachment(filename).send(csv);
  });
  router.post(TRIPS_PATH, allow('trips', 'create'), async (req, res) => {
    const input = parse(CreateTripInputSchema, req.body);
    const { trip, created } = await createTrip(db, req.actor!, input, now());
    res.status(created ? 201 : 200).json(trip);
  });
  router.get(one, allow('trips', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    res.json(await getTrip(db, req.actor!, id));
  });
  router.patch(one, allow('trips', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(UpdateTripInputSchema, req.body);
    res.json(await updateTrip(db, req.actor!, id, input, now()));
  });
  router.delete(one, allow('trips', 'delete'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    await deleteTrip(db, req.actor!, id, now());
    res.status(204).end();
  });
  return router;
}
