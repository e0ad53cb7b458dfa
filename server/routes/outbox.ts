import { Router } from 'express';
import { OUTBOX_PATH, OutboxListQuerySchema } from '../../shared/api/outbox';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { listOutbox } from '../services/outbox';
import type { RouteDeps } from './deps';

export function outboxRouter({ db }: RouteDeps) {
  const router = Router();
  router.get(OUTBOX_PATH, allow('outbox', 'list'), async (req, res) => {
    const query = parse(OutboxListQuerySchema, req.query, 'query');
    res.json(await listOutbox(db, req.actor!, query));
  });
  return router;
}
