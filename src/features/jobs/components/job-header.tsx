import { useState } from 'react';
import { Link } from 'react-router';
import { Button } from '../../../components/ui/button';
import { FormField } from '../../../components/ui/form-field';
import { Panel } from '../../../components/ui/panel';
import {
  JOB_STATUS_LABELS,
  JOB_TRANSITIONS,
  type JobDetail,
  type JobStatus,
} from '../../../../shared/api/jobs';
import { pathTo } from '../../../app/paths';
import { useChangeJobStatus } from '../api/mutations';
import { errorText } from '../../../lib/error-text';
import { formatWhen } from './job-format';
import { JobStatusPill } from './job-status';

/** The job at a glance, and the status moves this person may make from here. */
export function JobHeader({ job, mayMove }: { job: JobDetail; mayMove: boolean }) {
  const change = useChangeJobStatus(job.id);
  const [note, setNote] = useState('');
  const moves = JOB_TRANSITIONS[job.status];
  const move = (status: JobStatus) =>
    change.mutate(
      { status, ...(note.trim() ? { note: note.trim() } : {}) },
      { onSuccess: () => setNote('') },
    );

  return (
    <Panel>
      <div className="flex flex-wrap items-center gap-3">
        <JobStatusPill status={job.status} />
        <span className="text-lg text-ink-soft">{formatWhen(job.scheduledAt)}</span>
        {job.location ? <span className="text-lg text-ink-soft">· {job.location}</span> : null}
      </div>
      <dl className="mt-4 grid gap-3 sm:grid-cols-2">
        <div>
          <dt className="text-sm font-bold tracking-wider uppercase">Customer</dt>
          <dd className="text-xl font-bold">
            <Link className="underline underline-offset-4" to={pathTo.customer(job.customerId)}>
              {job.customerName}
            </Link>
          </dd>
        </div>
        <div>
          <dt className="text-sm font-bold tracking-wider uppercase">Machine</dt>
          <dd className="text-xl font-bold">
            <Link className="underline underline-offset-4" to={pathTo.machine(job.machineId)}>
              {job.machineName}
            </Link>
            {job.meterReading !== null ? (
              <span className="ml-2 text-lg font-medium text-ink-soft">
                at {job.meterReading} on the meter
              </span>
            ) : null}
          </dd>
        </div>
        <div className="sm:col-span-2">
          <dt className="text-sm font-bold tracking-wider uppercase">Complaint</dt>
          <dd className="max-w-prose text-lg">{job.complaint}</dd>
        </div>
        {job.diagnosis ? (
          <div className="sm:col-span-2">
            <dt className="text-sm font-bold tracking-wider uppercase">Diagnosis</dt>
            <dd className="max-w-prose text-lg">{job.diagnosis}</dd>
          </div>
        ) : null}
      </dl>
      {mayMove && moves.length > 0 ? (
        <div className="mt-5 grid gap-3 border-t-2 border-rule pt-4">
          <h2 className="text-lg font-bold">Move the job on</h2>
          <FormField
            label="Note with the move (optional)"
            value={note}
            maxLength={2000}
            onChange={(event) => setNote(event.target.value)}
          />
          <div className="flex flex-wrap gap-3">
            {moves.map((status) => (
              <Button
                key={status}
                variant={status === 'cancelled' ? 'secondary' : 'primary'}
                disabled={change.isPending}
                onClick={() => move(status)}
              >
                {status === 'cancelled' ? 'Cancel the job' : `To ${JOB_STATUS_LABELS[status]}`}
              </Button>
            ))}
          </div>
          <p aria-live="polite" className="text-base">
            {change.isPending ? 'Saving the move…' : null}
            {change.isSuccess ? `Moved to ${JOB_STATUS_LABELS[change.data.status]}.` : null}
          </p>
          {change.isError ? (
            <p role="alert" className="text-base font-bold text-fail">
              Not moved: {errorText(change.error)}
            </p>
          ) : null}
        </div>
      ) : null}
      {mayMove && moves.length === 0 && (job.status === 'invoiced' || job.status === 'paid') ? (
        <p className="mt-4 text-base text-ink-soft">
          A {JOB_STATUS_LABELS[job.status]} job moves only through its invoice.
        </p>
      ) : null}
    </Panel>
  );
}
