import { Router } from 'express';
import {
  AnswerCheckStepInputSchema,
  CheckRunListQuerySchema,
  CheckRunParamsSchema,
  CreateCheckRunInputSchema,
  EmptyBodySchema,
  JOB_CHECKS_PATH,
} from '../../shared/api/checks';
import { IdParamsSchema } from '../../shared/api/common';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import {
  answerCheckStep,
  backCheckStep,
  createCheckRun,
  getCheckRun,
  listCheckRuns,
  pauseCheckRun,
} from '../services/checks';
import { applyCheckLines } from '../services/line-items';
import type { RouteDeps } from './deps';

export function checksRouter({ db, now }: RouteDeps) {
  const router = Router();
  const one = `${JOB_CHECKS_PATH}/:runId`;

  router.get(JOB_CHECKS_PATH, allow('checks', 'list'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const query = parse(CheckRunListQuerySchema, req.query, 'query');
    res.json(await listCheckRuns(db, req.actor!, id, query));
  });
  router.post(JOB_CHECKS_PATH, allow('checks', 'create'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(CreateCheckRunInputSchema, req.body);
    const { run, created } = await createCheckRun(db, req.actor!, id, input, now());
    // A replayed clientId is the run already stored, not a new one.
    res.status(created ? 201 : 200).json(run);
  });
  router.get(one, allow('checks', 'read'), async (req, res) => {
    const { id, runId } = parse(CheckRunParamsSchema, req.params, 'path');
    res.json(await getCheckRun(db, req.actor!, id, runId));
  });
  router.post(`${one}/steps`, allow('checks', 'update'), async (req, res) => {
    const { id, runId } = parse(CheckRunParamsSchema, req.params, 'path');
    const input = parse(AnswerCheckStepInputSchema, req.body);
    res.status(201).json(await answerCheckStep(db, req.actor!, id, runId, input, now()));
  });
  router.post(`${one}/back`, allow('checks', 'update'), async (req, res) => {
    const { id, runId } = parse(CheckRunParamsSchema, req.params, 'path');
    parse(EmptyBodySchema, req.body ?? {});
    res.json(await backCheckStep(db, req.actor!, id, runId));
  });
  router.post(`${one}/pause`, allow('checks', 'update'), async (req, res) => {
    const { id, runId } = parse(CheckRunParamsSchema, req.params, 'path');
    parse(EmptyBodySchema, req.body ?? {});
    res.json(await pauseCheckRun(db, req.actor!, id, runId));
  });
  // Prices are the owner's (the policy's line items), though the route sits under the run.
  router.post(`${one}/apply-lines`, allow('lineItems', 'create'), async (req, res) => {
    const { id, runId } = parse(CheckRunParamsSchema, req.params, 'path');
    parse(EmptyBodySchema, req.body ?? {});
    const applied = await applyCheckLines(db, req.actor!, id, runId, now());
    res.status(applied.items.length > 0 ? 201 : 200).json(applied);
  });
  return router;
}
