import { Router } from 'express';
import { BUSINESS_PATH, UpdateBusinessInputSchema } from '../../shared/api/business';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { getBusinessSettings, updateBusinessSettings } from '../services/business';
import type { RouteDeps } from './deps';

/** The signed-in person's own business: its profile and money settings (policy row `business`). */
export function businessRouter({ db, now }: RouteDeps) {
  const router = Router();
  router.get(BUSINESS_PATH, allow('business', 'read'), async (req, res) => {
    res.json(await getBusinessSettings(db, req.actor!));
  });
  router.patch(BUSINESS_PATH, allow('business', 'update'), async (req, res) => {
    const input = parse(UpdateBusinessInputSchema, req.body);
    res.json(await updateBusinessSettings(db, req.actor!, input, now()));
  });
  return router;
}
