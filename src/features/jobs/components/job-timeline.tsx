import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { TextAreaField } from '../../../components/ui/form-field';
import { Panel } from '../../../components/ui/panel';
import { JOB_STATUS_LABELS, type JobDetail } from '../../../../shared/api/jobs';
import { useAddJobNote } from '../api/mutations';
import { errorText } from '../../../lib/error-text';
import { formatWhen } from './job-format';

/** What happened to the job, oldest first: every status move and every note. */
export function JobTimeline({ job, mayNote }: { job: JobDetail; mayNote: boolean }) {
  const add = useAddJobNote(job.id);
  const [note, setNote] = useState('');
  return (
    <Panel>
      <h2 className="text-xl font-bold">Timeline</h2>
      <ol className="mt-3 grid gap-3">
        {job.events.map((event) => (
          <li key={event.id} className="border-l-4 border-rule pl-3">
            <p className="text-base text-ink-soft">
              {formatWhen(event.at)}
              {event.actorName ? ` · ${event.actorName}` : ''}
            </p>
            <p className="text-lg">
              {event.kind === 'status' && event.toStatus ? (
                <strong>
                  {event.fromStatus
                    ? `${JOB_STATUS_LABELS[event.fromStatus]} → ${JOB_STATUS_LABELS[event.toStatus]}`
                    : event.toStatus === 'booked'
                      ? 'Booked'
                      : `Opened as ${JOB_STATUS_LABELS[event.toStatus]}`}
                </strong>
              ) : null}
              {event.note ? <span className="block">{event.note}</span> : null}
            </p>
          </li>
        ))}
      </ol>
      {mayNote ? (
        <form
          className="mt-4 grid gap-3"
          onSubmit={(event) => {
            event.preventDefault();
            if (note.trim() === '') return;
            add.mutate({ note: note.trim() }, { onSuccess: () => setNote('') });
          }}
        >
          <TextAreaField
            label="Add a note"
            value={note}
            maxLength={2000}
            onChange={(event) => setNote(event.target.value)}
          />
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" variant="secondary" disabled={add.isPending || note.trim() === ''}>
              {add.isPending ? 'Adding…' : 'Add the note'}
            </Button>
            {add.isError ? (
              <p role="alert" className="text-base font-bold text-fail">
                Not added: {errorText(add.error)}
              </p>
            ) : null}
          </div>
        </form>
      ) : null}
    </Panel>
  );
}
