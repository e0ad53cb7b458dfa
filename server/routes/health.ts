import { Router } from 'express';
import { HEALTH_PATH, type Health } from '../../shared/api/health';
import type { Db } from '../db/client';
import { checkDatabase } from '../services/health';

export function healthRouter(db: Db) {
  const router = Router();
  // Mounted under /api; answers without sign-in (CONTRACT.md).
  router.get(HEALTH_PATH.replace(/^\/api/, ''), async (_req, res) => {
    const ok = await checkDatabase(db);
    const body: Health = { ok };
    res.status(ok ? 200 : 503).json(body);
  });
  return router;
}
