import { useParams, useSearchParams } from 'react-router';
import { EmptyState } from '../../components/ui/empty-state';
import { PageHeading } from '../../components/ui/page-heading';
import { CheckRunWalk } from '../../features/checks/components/check-run-walk';
import { StartCheckRun } from '../../features/checks/components/start-check-run';
import { useSessionUser } from '../../features/session/api/queries';

/** Route ids are positive integers, as the API's are; anything else is no such check. */
function idOf(text: string | undefined): number | null {
  return text && /^[1-9]\d{0,9}$/.test(text) && Number(text) <= 2_147_483_647 ? Number(text) : null;
}

/**
 * A guided check in the browser: `/jobs/:jobId/checks/new?procedure=…` starts one, and
 * `/jobs/:jobId/checks/:runId` walks an open run (from here or the van) or shows a finished one.
 */
export function Component() {
  const params = useParams();
  const [search] = useSearchParams();
  const { role } = useSessionUser();
  const jobId = idOf(params.jobId);
  const runId = params.runId === 'new' ? 'new' : idOf(params.runId);
  if (jobId === null || runId === null) {
    return (
      <>
        <PageHeading title="No such check" />
        <EmptyState title="This address names no check">
          <p>A check’s address is the job’s number and the check’s, as the job page links them.</p>
        </EmptyState>
      </>
    );
  }
  if (runId === 'new') return <StartCheckRun jobId={jobId} procedure={search.get('procedure')} role={role} />;
  // Keyed by the run, so moving to another check starts its page afresh.
  return <CheckRunWalk key={`${jobId}-${runId}`} jobId={jobId} runId={runId} role={role} />;
}
