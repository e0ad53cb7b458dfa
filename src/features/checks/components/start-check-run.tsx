import { useEffect, useRef, useState } from 'react';
import { Link, useNavigate } from 'react-router';
import { isAllowed } from '../../../../shared/api/policy';
import type { Role } from '../../../../shared/api/users';
import { PROCEDURES } from '../../../../shared/procedures/index';
import { AlertPanel } from '../../../components/ui/alert-panel';
import { Button, buttonClasses } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { PageHeading } from '../../../components/ui/page-heading';
import { pathTo } from '../../../app/paths';
import { useStartCheckRun } from '../api/mutations';
import { newClientId } from '../client-id';
import { isProcedureKey, newRunSearch, STARTABLE } from '../procedures';
import { failureText } from './failure-text';

/**
 * `/jobs/:jobId/checks/new?procedure=…`: starts the run at once and replaces the address with the
 * run's own, so a reload or a shared link opens the run, never a second one. One client id per
 * visit makes a repeated start (a double render, a retry) land as the same run.
 */
export function StartCheckRun({
  jobId,
  procedure,
  role,
}: {
  jobId: number;
  procedure: string | null;
  role: Role;
}) {
  if (!isProcedureKey(procedure)) {
    return (
      <>
        <PageHeading title="Start a check" />
        <EmptyState title={procedure ? `There is no check called “${procedure}”` : 'Which check?'}>
          <p>Pick one to start on job {jobId}:</p>
          <div className="mt-3 flex flex-wrap gap-3">
            {STARTABLE.map((p) => (
              <Link
                key={p.key}
                to={`${pathTo.checkRun(jobId, 'new')}${newRunSearch(p.key)}`}
                className={buttonClasses()}
              >
                {p.title}
              </Link>
            ))}
          </div>
        </EmptyState>
      </>
    );
  }
  if (!isAllowed(role, 'checks', 'create')) {
    return (
      <>
        <PageHeading title={PROCEDURES[procedure].title} />
        <EmptyState title="Checks are started by the workshop">
          <p>
            Guided checks are run by the mechanic and the helper; this sign-in can read the finished ones.
          </p>
          <Link to={pathTo.job(jobId)} className={`mt-4 ${buttonClasses('secondary')}`}>
            Back to job {jobId}
          </Link>
        </EmptyState>
      </>
    );
  }
  return <Starting key={procedure} jobId={jobId} procedure={procedure} />;
}

function Starting({ jobId, procedure }: { jobId: number; procedure: keyof typeof PROCEDURES }) {
  const navigate = useNavigate();
  const start = useStartCheckRun(jobId);
  const [clientId] = useState(newClientId);
  const asked = useRef(false);
  const { mutate, data: run } = start;

  useEffect(() => {
    if (asked.current) return;
    asked.current = true;
    mutate({ procedure, clientId });
  }, [mutate, procedure, clientId]);

  // The run's own address replaces "new", so back and reload never start another.
  useEffect(() => {
    if (run) void navigate(pathTo.checkRun(jobId, run.id), { replace: true });
  }, [run, jobId, navigate]);

  const title = PROCEDURES[procedure].title;
  if (start.isError) {
    return (
      <>
        <PageHeading title={title} />
        <AlertPanel title="The check could not be started">
          <p>{failureText(start.error)}</p>
          <Button className="mt-4" onClick={() => mutate({ procedure, clientId })} disabled={start.isPending}>
            Try again
          </Button>
        </AlertPanel>
      </>
    );
  }
  return (
    <>
      <PageHeading title={title} />
      <p role="status" className="text-lg text-ink-soft">
        Starting the {title.toLowerCase()} on job {jobId}…
      </p>
    </>
  );
}
