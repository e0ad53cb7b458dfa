import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreatePaymentInputSchema,
  INVOICE_PAYMENTS_PATH,
  PaymentListQuerySchema,
} from '../../shared/api/invoices';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { listPayments, recordPayment } from '../services/payments';
import type { RouteDeps } from './deps';

export function paymentsRouter({ db, now, payments }: RouteDeps) {
  const router = Router();

  router.get(INVOICE_PAYMENTS_PATH, allow('payments', 'list'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const query = parse(PaymentListQuerySchema, req.query, 'query');
    res.json(await listPayments(db, req.actor!, id, query));
  });
  router.post(INVOICE_PAYMENTS_PATH, allow('payments', 'create'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(CreatePaymentInputSchema, req.body);
    res.status(201).json(await recordPayment(db, payments, req.actor!, id, input, now()));
  });
  return router;
}
