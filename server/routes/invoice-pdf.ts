import { Router } from 'express';
import { z } from 'zod';
import { IdParamsSchema } from '../../shared/api/common';
import { INVOICES_PATH } from '../../shared/api/invoices';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { invoicePdf } from '../services/invoice-documents';
import type { RouteDeps } from './deps';

export const INVOICE_PDF_PATH = `${INVOICES_PATH}/:id/pdf`;

/** `?paper=letter|a4`; Letter when left out, the sheet a US business prints on. */
export const InvoicePdfQuerySchema = z.strictObject({ paper: z.enum(['letter', 'a4']).default('letter') });

export function invoicePdfRouter({ db, now }: RouteDeps) {
  const router = Router();
  // Reading the PDF is reading the invoice: the same policy row, the same customer scoping.
  router.get(INVOICE_PDF_PATH, allow('invoices', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const { paper } = parse(InvoicePdfQuerySchema, req.query, 'query');
    const { filename, bytes } = await invoicePdf(db, req.actor!, id, { paper, now: now() });
    res
      .status(200)
      .type('application/pdf')
      .set('Content-Disposition', `inline; filename="${filename}"`)
      .set('Cache-Control', 'private, no-store')
      .send(bytes);
  });
  return router;
}
