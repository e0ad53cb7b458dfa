import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { CheckRunListSchema, CheckRunSchema, jobChecksPath } from '../../../../shared/api/checks';
import type { CheckRun, CheckRunSummary } from '../../../../shared/api/checks';
import { JobStatusSchema, jobPath } from '../../../../shared/api/jobs';
import type { JobStatus } from '../../../../shared/api/jobs';
import { MachineSchema, machinePath } from '../../../../shared/api/machines';
import type { MachineSpec } from '../../../../shared/procedures/specs';
import { request } from '../../../lib/api-client';

/** A job's runs, newest first: a job has a handful, so one page of the most the API allows is all. */
const RUNS_PAGE = 100;

export async function fetchCheckRuns(jobId: number, signal?: AbortSignal): Promise<CheckRunSummary[]> {
  const path = `${jobChecksPath(jobId)}?${new URLSearchParams({ limit: String(RUNS_PAGE) })}`;
  const page = await request(path, CheckRunListSchema, signal ? { signal } : {});
  return page.items;
}

export function fetchCheckRun(jobId: number, runId: number, signal?: AbortSignal): Promise<CheckRun> {
  return request(`${jobChecksPath(jobId)}/${runId}`, CheckRunSchema, signal ? { signal } : {});
}

/** Just what the check pages need of the job: which machine, and the names to head the page with. */
const JobForCheckSchema = z.object({
  id: z.number().int(),
  status: JobStatusSchema,
  machineId: z.number().int(),
  customerName: z.string(),
  machineName: z.string(),
});
const MachineLimitsSchema = MachineSchema.pick({
  fuelPressureMinKpa: true,
  fuelPressureMaxKpa: true,
  holdMaxDropKpa: true,
  holdMinutes: true,
  flowMinLph: true,
});

export interface CheckJobContext {
  jobId: number;
  jobStatus: JobStatus;
  customerName: string;
  machineName: string;
  /** The machine's service-manual limits (null ones fall back to the generic defaults). */
  spec: MachineSpec;
}

/**
 * The limits a run is judged by while typing, read the same way the CLI reads them: the job's
 * machine. The server judges again with the limits the run started with, and its verdict is the record.
 */
export async function fetchCheckJobContext(jobId: number, signal?: AbortSignal): Promise<CheckJobContext> {
  const init = signal ? { signal } : {};
  const job = await request(jobPath(jobId), JobForCheckSchema, init);
  const spec = await request(machinePath(job.machineId), MachineLimitsSchema, init);
  return { jobId, jobStatus: job.status, customerName: job.customerName, machineName: job.machineName, spec };
}

export const checkQueries = {
  all: () => ['checks'] as const,
  /** Everything cached about one job's checks: invalidate this after changing the job's runs. */
  job: (jobId: number) => [...checkQueries.all(), 'job', jobId] as const,
  lists: (jobId: number) => [...checkQueries.job(jobId), 'list'] as const,
  list: (jobId: number) =>
    queryOptions({
      queryKey: checkQueries.lists(jobId),
      queryFn: ({ signal }) => fetchCheckRuns(jobId, signal),
    }),
  details: (jobId: number) => [...checkQueries.job(jobId), 'run'] as const,
  detail: (jobId: number, runId: number) =>
    queryOptions({
      queryKey: [...checkQueries.details(jobId), runId] as const,
      queryFn: ({ signal }) => fetchCheckRun(jobId, runId, signal),
    }),
  context: (jobId: number) =>
    queryOptions({
      queryKey: [...checkQueries.job(jobId), 'context'] as const,
      queryFn: ({ signal }) => fetchCheckJobContext(jobId, signal),
      // The machine's limits change rarely, and never mid-walk on purpose.
      staleTime: 5 * 60_000,
    }),
};

export function useCheckRuns(jobId: number) {
  return useQuery(checkQueries.list(jobId));
}

export function useCheckRun(jobId: number, runId: number) {
  return useQuery(checkQueries.detail(jobId, runId));
}

export function useCheckJobContext(jobId: number) {
  return useQuery(checkQueries.context(jobId));
}
