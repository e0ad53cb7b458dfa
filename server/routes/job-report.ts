import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import { JOB_REPORT_PDF_PATH, JOB_REPORT_SEND_PATH, PaperQuerySchema } from '../../shared/api/job-documents';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { reportPdf } from '../services/report-documents';
import { sendReportMail } from '../services/report-mail';
import { SendQuerySchema } from './invoice-send';
import type { RouteDeps } from './deps';

export function jobReportRouter({ db, now, mailer }: RouteDeps) {
  const router = Router();
  // The report is the job's checks and readings in plain words: whoever may read its checks may
  // read it (the customer only their own, scoped in the service; anyone else's is a 404).
  router.get(JOB_REPORT_PDF_PATH, allow('checks', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const { paper } = parse(PaperQuerySchema, req.query, 'query');
    const { filename, bytes } = await reportPdf(db, req.actor!, id, { paper, now: now() });
    res
      .status(200)
      .type('application/pdf')
      .set('Content-Disposition', `inline; filename="${filename}"`)
      .set('Cache-Control', 'private, no-store')
      .send(bytes);
  });
  // Mail to the customer is the owner's to send, as invoices are (the `invoices` update row).
  router.post(JOB_REPORT_SEND_PATH, allow('invoices', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const { again } = parse(SendQuerySchema, req.query, 'query');
    res.status(202).json(await sendReportMail(db, mailer, req.actor!, id, { again }, now()));
  });
  return router;
}
