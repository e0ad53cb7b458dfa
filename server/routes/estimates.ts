import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateEstimateInputSchema,
  DecideEstimateInputSchema,
  ESTIMATE_APPROVE_PATH,
  ESTIMATE_DECLINE_PATH,
  ESTIMATE_PDF_PATH,
  EstimateListQuerySchema,
  JOB_ESTIMATE_PATH,
  JOB_ESTIMATES_PATH,
} from '../../shared/api/estimates';
import { PaperQuerySchema } from '../../shared/api/job-documents';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { estimatePdf } from '../services/estimate-documents';
import { createEstimate, decideEstimate, listEstimates } from '../services/estimates';
import type { RouteDeps } from './deps';

/**
 * Estimates use the money rows of the policy table: quoting prices is the owner's (`lineItems`
 * create), reading an estimate is reading the job's money (`invoices` list and read: owner,
 * bookkeeper, the job's customer). Answering one is for the roles that may read both the job's
 * money and its workshop record (`invoices` read and `checks` read): the owner and the customer;
 * the service scopes the customer to their own jobs and records the owner as acting on their word.
 */
export function estimatesRouter({ db, now, mailer }: RouteDeps) {
  const router = Router();
  router.post(JOB_ESTIMATE_PATH, allow('lineItems', 'create'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(CreateEstimateInputSchema, req.body ?? {});
    res.status(201).json(await createEstimate(db, mailer, req.actor!, id, input, now()));
  });
  router.get(JOB_ESTIMATES_PATH, allow('invoices', 'list'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const query = parse(EstimateListQuerySchema, req.query, 'query');
    res.json(await listEstimates(db, req.actor!, id, query));
  });
  router.get(ESTIMATE_PDF_PATH, allow('invoices', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const { paper } = parse(PaperQuerySchema, req.query, 'query');
    const { filename, bytes } = await estimatePdf(db, req.actor!, id, { paper, now: now() });
    res
      .status(200)
      .type('application/pdf')
      .set('Content-Disposition', `inline; filename="${filename}"`)
      .set('Cache-Control', 'private, no-store')
      .send(bytes);
  });
  for (const [path, decision] of [
    [ESTIMATE_APPROVE_PATH, 'approved'],
    [ESTIMATE_DECLINE_PATH, 'declined'],
  ] as const) {
    router.post(path, allow('invoices', 'read'), allow('checks', 'read'), async (req, res) => {
      const { id } = parse(IdParamsSchema, req.params, 'path');
      const input = parse(DecideEstimateInputSchema, req.body ?? {});
      res.json(await decideEstimate(db, req.actor!, id, decision, input, now()));
    });
  }
  return router;
}
