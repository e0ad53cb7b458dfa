import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { QueryClient } from '@tanstack/react-query';
import { CheckRunSchema, jobChecksPath } from '../../../../shared/api/checks';
import type { CheckRun, StepAnswerInput } from '../../../../shared/api/checks';
import { AppliedLinesSchema } from '../../../../shared/api/line-items';
import type { ProcedureKey } from '../../../../shared/procedures/index';
import { jsonInit, request } from '../../../lib/api-client';
import { checkQueries } from './queries';

const runPath = (jobId: number, runId: number) => `${jobChecksPath(jobId)}/${runId}`;

/**
 * The server's answer is the run as it now stands (its own walk of the stored answers), so it
 * replaces the cached run outright; the job's list of runs changes status with it.
 */
function storeRun(queryClient: QueryClient, run: CheckRun) {
  queryClient.setQueryData(checkQueries.detail(run.jobId, run.id).queryKey, run);
  void queryClient.invalidateQueries({ queryKey: checkQueries.lists(run.jobId) });
}

/**
 * Starts a run. The client id makes the start idempotent: a request repeated (a double render, a
 * retry after a dropped answer) returns the run already made instead of a second one.
 */
export function useStartCheckRun(jobId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ procedure, clientId }: { procedure: ProcedureKey; clientId: string }) =>
      request(jobChecksPath(jobId), CheckRunSchema, jsonInit('POST', { procedure, clientId })),
    onSuccess: (run) => storeRun(queryClient, run),
  });
}

/** One answer to the current step; the server re-walks the run and its verdict is what is kept. */
export function useAnswerCheckStep(jobId: number, runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: StepAnswerInput) =>
      request(`${runPath(jobId, runId)}/steps`, CheckRunSchema, jsonInit('POST', input)),
    onSuccess: (run) => storeRun(queryClient, run),
  });
}

export function useBackCheckStep(jobId: number, runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => request(`${runPath(jobId, runId)}/back`, CheckRunSchema, jsonInit('POST', {})),
    onSuccess: (run) => storeRun(queryClient, run),
  });
}

export function usePauseCheckRun(jobId: number, runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => request(`${runPath(jobId, runId)}/pause`, CheckRunSchema, jsonInit('POST', {})),
    onSuccess: (run) => storeRun(queryClient, run),
  });
}

/**
 * Adds the finished run's suggested lines to the job (the owner's: prices are theirs). The run's
 * `linesApplied` changes with it, so the run is fetched again.
 */
export function useApplyCheckLines(jobId: number, runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () =>
      request(`${runPath(jobId, runId)}/apply-lines`, AppliedLinesSchema, jsonInit('POST', {})),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: checkQueries.detail(jobId, runId).queryKey }),
  });
}
