import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateReadingInputSchema,
  JOB_READINGS_PATH,
  ReadingListQuerySchema,
  ReadingParamsSchema,
} from '../../shared/api/readings';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { createReading, deleteReading, listReadings } from '../services/readings';
import type { RouteDeps } from './deps';

export function readingsRouter({ db, now }: RouteDeps) {
  const router = Router();

  router.get(JOB_READINGS_PATH, allow('readings', 'list'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const query = parse(ReadingListQuerySchema, req.query, 'query');
    res.json(await listReadings(db, req.actor!, id, query));
  });
  router.post(JOB_READINGS_PATH, allow('readings', 'create'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(CreateReadingInputSchema, req.body);
    const { reading, created } = await createReading(db, req.actor!, id, input, now());
    // A replayed clientId is the reading already stored, not a new one.
    res.status(created ? 201 : 200).json(reading);
  });
  router.delete(`${JOB_READINGS_PATH}/:readingId`, allow('readings', 'delete'), async (req, res) => {
    const { id, readingId } = parse(ReadingParamsSchema, req.params, 'path');
    await deleteReading(db, req.actor!, id, readingId, now());
    res.status(204).end();
  });
  return router;
}
