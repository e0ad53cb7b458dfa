import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router';
import { AlertPanel } from '../../components/ui/alert-panel';
import { PageHeading } from '../../components/ui/page-heading';
import { isAllowed } from '../../../shared/api/policy';
import { CheckRunsPanel } from '../../features/checks/components/check-runs-panel';
import { jobQueries } from '../../features/jobs/api/queries';
import { AttachmentsPanel } from '../../features/jobs/components/attachments-panel';
import { DocumentsPanel } from '../../features/jobs/components/documents-panel';
import { JobHeader } from '../../features/jobs/components/job-header';
import { JobTimeline } from '../../features/jobs/components/job-timeline';
import { LineItemsPanel } from '../../features/jobs/components/line-items-panel';
import { ReadingsPanel } from '../../features/jobs/components/readings-panel';
import { useSessionUser } from '../../features/session/api/queries';
import { ApiError } from '../../lib/api-client';
import { errorText } from '../../lib/error-text';
import { paths } from '../paths';

/** One job from booking to paid: what was wrong, what was measured, what was done and billed. */
export function Component() {
  const { role } = useSessionUser();
  const jobId = Number(useParams().jobId);
  const valid = Number.isSafeInteger(jobId) && jobId > 0;
  const job = useQuery({ ...jobQueries.detail(jobId), enabled: valid });

  if (!valid || (job.isError && job.error instanceof ApiError && job.error.status === 404)) {
    return (
      <>
        <PageHeading title="No such job" />
        <AlertPanel title="This job does not exist, or is not yours to see">
          <p>
            Back to{' '}
            <Link className="font-bold underline" to={paths.jobs}>
              the jobs
            </Link>
            .
          </p>
        </AlertPanel>
      </>
    );
  }
  if (job.isPending) {
    return (
      <p role="status" className="text-lg text-ink-soft">
        Loading job #{jobId}…
      </p>
    );
  }
  if (job.isError) {
    return (
      <AlertPanel title={`Job #${jobId} could not be loaded`}>
        <p>{errorText(job.error)}</p>
      </AlertPanel>
    );
  }

  const data = job.data;
  const workshop = isAllowed(role, 'jobs', 'update');
  return (
    <>
      <PageHeading title={`Job #${data.id} · ${data.machineName}`} />
      <div className="grid grid-cols-1 items-start gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="grid gap-6">
          <JobHeader job={data} mayMove={workshop} />
          {isAllowed(role, 'checks', 'list') ? <CheckRunsPanel jobId={data.id} /> : null}
          {isAllowed(role, 'readings', 'list') ? (
            <ReadingsPanel jobId={data.id} mayAdd={isAllowed(role, 'readings', 'create')} />
          ) : null}
          {isAllowed(role, 'lineItems', 'list') ? (
            <LineItemsPanel jobId={data.id} mayEdit={isAllowed(role, 'lineItems', 'update')} />
          ) : null}
        </div>
        <div className="grid gap-6">
          <JobTimeline job={data} mayNote={workshop} />
          <DocumentsPanel
            job={data}
            rights={{
              readReport: isAllowed(role, 'checks', 'read'),
              sendDocuments: isAllowed(role, 'lineItems', 'create'),
              listEstimates: isAllowed(role, 'invoices', 'list'),
              decide: role === 'customer' ? 'customer' : role === 'owner' ? 'owner' : null,
            }}
          />
          {isAllowed(role, 'attachments', 'list') ? (
            <AttachmentsPanel jobId={data.id} mayUpload={isAllowed(role, 'attachments', 'create')} />
          ) : null}
        </div>
      </div>
    </>
  );
}
