import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateInvoiceInputSchema,
  InvoiceListQuerySchema,
  INVOICES_PATH,
  UpdateInvoiceInputSchema,
} from '../../shared/api/invoices';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { createInvoice, getInvoice, listInvoices, voidInvoice } from '../services/invoices';
import type { RouteDeps } from './deps';

export function invoicesRouter({ db, now, payments }: RouteDeps) {
  const router = Router();
  const one = `${INVOICES_PATH}/:id`;

  router.get(INVOICES_PATH, allow('invoices', 'list'), async (req, res) => {
    const query = parse(InvoiceListQuerySchema, req.query, 'query');
    res.json(await listInvoices(db, req.actor!, query, now()));
  });
  router.post(INVOICES_PATH, allow('invoices', 'create'), async (req, res) => {
    const input = parse(CreateInvoiceInputSchema, req.body);
    res.status(201).json(await createInvoice(db, req.actor!, input, now()));
  });
  router.get(one, allow('invoices', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    res.json(await getInvoice(db, req.actor!, id, now()));
  });
  router.patch(one, allow('invoices', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    // The schema admits only { status: 'void' }: voiding is the one change an invoice takes here.
    parse(UpdateInvoiceInputSchema, req.body);
    res.json(await voidInvoice(db, payments, req.actor!, id, now()));
  });
  return router;
}
