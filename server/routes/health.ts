import { Router } from 'express';
import { HEALTH_PATH, type Health } from '../../shared/api/health';
import type { Db } from '../db/client';
import { checkDatabase } from '../services/health';

/** Answers without sign-in (CONTRACT.md): healthy means the database answers too. */
export function healthRouter(db: Db) {
  const router = Router();
  router.get(HEALTH_PATH, async (_req, res) => {
    const ok = await checkDatabase(db);
    const body: Health = { ok };
    res.status(ok ? 200 : 503).json(body);
  });
  return router;
}
