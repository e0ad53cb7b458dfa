import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import { CreatePaymentLinkInputSchema, INVOICE_PAYMENT_LINK_PATH } from '../../shared/api/payments';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { ensurePaymentLink } from '../services/card-payments';
import type { RouteDeps } from './deps';

/**
 * The owner asks for an invoice's card link: 201 with a new one, 200 with the open one already
 * made for that amount; 503 when card payments are not set up on this server.
 */
export function paymentLinkRouter({ db, now, payments }: RouteDeps) {
  const router = Router();
  router.post(INVOICE_PAYMENT_LINK_PATH, allow('invoices', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(CreatePaymentLinkInputSchema, req.body ?? {});
    const link = await ensurePaymentLink(db, payments, req.actor!, id, input, now());
    res.status(link.created ? 201 : 200).json(link);
  });
  return router;
}
