import express, { Router } from 'express';
import { PAYMENT_WEBHOOK_PATH, WEBHOOK_MAX_BYTES } from '../../shared/api/payments';
import { HttpError } from '../errors';
import { PaymentsNotSetUpError } from '../payments/provider';
import { applyPaymentEvent } from '../services/card-payments';
import type { RouteDeps } from './deps';

/**
 * The payment service's webhook. No sign-in: the signature over the exact bytes sent is the
 * proof, so the body is read raw here (whatever its type), and app.ts mounts this router ahead
 * of the /api JSON parser and the session check. A bad signature is a 400 with nothing stored;
 * an event seen before is a 200 that changes nothing, so the service stops resending it.
 */
export function paymentWebhookRouter({ db, now, payments }: Pick<RouteDeps, 'db' | 'now' | 'payments'>) {
  const router = Router();
  const readRaw = express.raw({ type: () => true, limit: WEBHOOK_MAX_BYTES });
  router.post(
    PAYMENT_WEBHOOK_PATH,
    (req, res, next) => {
      if (!payments.available) return next(new PaymentsNotSetUpError());
      readRaw(req, res, (error?: unknown) => {
        const tooLarge = (error as { type?: string } | undefined)?.type === 'entity.too.large';
        next(tooLarge ? new HttpError(413, 'body_too_large', 'That is too large for a webhook.') : error);
      });
    },
    async (req, res) => {
      const raw = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
      const event = payments.verifyWebhook(raw, req.get('stripe-signature'));
      res.json(await applyPaymentEvent(db, event, now()));
    },
  );
  return router;
}
