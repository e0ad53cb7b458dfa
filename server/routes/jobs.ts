import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateJobInputSchema,
  CreateJobNoteInputSchema,
  JOBS_PATH,
  JobListQuerySchema,
  JobStatusChangeInputSchema,
  UpdateJobInputSchema,
} from '../../shared/api/jobs';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import {
  addJobNote,
  changeJobStatus,
  createJob,
  deleteJob,
  getJob,
  listJobs,
  updateJob,
} from '../services/jobs';
import type { RouteDeps } from './deps';

export function jobsRouter({ db, now }: RouteDeps) {
  const router = Router();
  const one = `${JOBS_PATH}/:id`;

  router.get(JOBS_PATH, allow('jobs', 'list'), async (req, res) => {
    const query = parse(JobListQuerySchema, req.query, 'query');
    res.json(await listJobs(db, req.actor!, query));
  });
  router.post(JOBS_PATH, allow('jobs', 'create'), async (req, res) => {
    const input = parse(CreateJobInputSchema, req.body);
    const { job, created } = await createJob(db, req.actor!, input, now());
    // A replayed clientId is answered with the job it made the first time.
    res.status(created ? 201 : 200).json(job);
  });
  router.get(one, allow('jobs', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    res.json(await getJob(db, req.actor!, id));
  });
  router.patch(one, allow('jobs', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(UpdateJobInputSchema, req.body);
    res.json(await updateJob(db, req.actor!, id, input, now()));
  });
  router.post(`${one}/status`, allow('jobs', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(JobStatusChangeInputSchema, req.body);
    res.json(await changeJobStatus(db, req.actor!, id, input, now()));
  });
  router.post(`${one}/notes`, allow('jobs', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(CreateJobNoteInputSchema, req.body);
    const { event, created } = await addJobNote(db, req.actor!, id, input, now());
    res.status(created ? 201 : 200).json(event);
  });
  router.delete(one, allow('jobs', 'delete'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    await deleteJob(db, req.actor!, id, now());
    res.status(204).end();
  });
  return router;
}
