import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button, buttonClasses } from '../../../components/ui/button';
import { FormField } from '../../../components/ui/form-field';
import { MutationStatus } from '../../../components/ui/mutation-status';
import { Panel } from '../../../components/ui/panel';
import { StatusPill } from '../../../components/ui/status-pill';
import type { Tone } from '../../../components/ui/tone';
import { estimatePdfPath, type Estimate } from '../../../../shared/api/estimates';
import { jobReportPdfPath } from '../../../../shared/api/job-documents';
import type { JobDetail } from '../../../../shared/api/jobs';
import { errorText } from '../../../lib/error-text';
import { formatCents } from '../../../lib/money';
import { jobQueries } from '../api/queries';
import { useDecideEstimate, useSendEstimate, useSendReport } from '../api/mutations';
import { formatWhen } from './job-format';

export type DocumentRights = {
  readReport: boolean;
  sendDocuments: boolean;
  listEstimates: boolean;
  /** A customer answers their own estimates; the owner records an answer given another way. */
  decide: 'customer' | 'owner' | null;
};

const ESTIMATE_TONES: Record<Estimate['status'], Tone> = {
  draft: 'quiet',
  sent: 'warn',
  approved: 'pass',
  declined: 'fail',
};
const ESTIMATE_WORDS: Record<Estimate['status'], string> = {
  draft: 'draft',
  sent: 'waiting for an answer',
  approved: 'approved',
  declined: 'declined',
};

/** The papers a job produces for its customer: the estimate to approve and the diagnostic report. */
export function DocumentsPanel({ job, rights }: { job: JobDetail; rights: DocumentRights }) {
  return (
    <Panel>
      <h2 className="text-xl font-bold">Estimate and report</h2>
      {rights.listEstimates ? <Estimates job={job} rights={rights} /> : null}
      {rights.readReport ? <Report jobId={job.id} maySend={rights.sendDocuments} /> : null}
    </Panel>
  );
}

function Estimates({ job, rights }: { job: JobDetail; rights: DocumentRights }) {
  const estimates = useQuery(jobQueries.estimates(job.id));
  const send = useSendEstimate(job.id);
  const [note, setNote] = useState('');
  const items = estimates.data?.items ?? [];
  const waiting = items.some((estimate) => estimate.status === 'sent');
  const mayQuote =
    rights.sendDocuments && (job.status === 'diagnosing' || job.status === 'awaiting_approval');

  return (
    <div className="mt-3 grid gap-3">
      {estimates.isError ? (
        <p role="alert" className="text-base font-bold text-fail">
          The estimates could not be loaded: {errorText(estimates.error)}
        </p>
      ) : null}
      {estimates.isSuccess && items.length === 0 ? (
        <p className="text-lg text-ink-soft">
          No estimate yet.{mayQuote ? ' Price the work and parts, then send the estimate for a yes.' : ''}
        </p>
      ) : null}
      <ul className="grid gap-3">
        {items.map((estimate) => (
          <EstimateItem key={estimate.id} jobId={job.id} estimate={estimate} decide={rights.decide} />
        ))}
      </ul>
      {mayQuote && !waiting ? (
        <form
          className="grid gap-3 border-t-2 border-rule pt-3"
          onSubmit={(event) => {
            event.preventDefault();
            send.mutate(note, { onSuccess: () => setNote('') });
          }}
        >
          <FormField
            label="Message on the estimate (optional)"
            value={note}
            maxLength={1000}
            onChange={(event) => setNote(event.target.value)}
          />
          <Button type="submit" className="justify-self-start" disabled={send.isPending}>
            {send.isPending ? 'Sending…' : 'Send the estimate'}
          </Button>
          <MutationStatus
            mutation={send}
            success={
              !send.data?.mail
                ? 'Estimate made; the customer has no e-mail address on file.'
                : send.data.mail.status === 'sent'
                  ? `Estimate sent to ${send.data.mail.to}.`
                  : `Estimate made; its mail has not gone yet${send.data.mail.lastError ? ` (the mail server said: ${send.data.mail.lastError})` : ''} and is tried again on its own until it goes.`
            }
            failure="The estimate was not sent."
          />
        </form>
      ) : null}
    </div>
  );
}

function EstimateItem({
  jobId,
  estimate,
  decide,
}: {
  jobId: number;
  estimate: Estimate;
  decide: DocumentRights['decide'];
}) {
  const decision = useDecideEstimate(jobId);
  const [note, setNote] = useState('');
  // The owner must say how the customer answered (by phone, in person); the customer may add a word.
  const noteNeeded = decide === 'owner' && note.trim() === '';
  const answer = (choice: 'approve' | 'decline') =>
    decision.mutate({ estimateId: estimate.id, decision: choice, note });

  return (
    <li className="grid gap-2 rounded-plate border-2 border-rule p-3">
      <div className="flex flex-wrap items-center gap-3">
        <strong className="text-lg">Estimate #{estimate.id}</strong>
        <StatusPill tone={ESTIMATE_TONES[estimate.status]}>{ESTIMATE_WORDS[estimate.status]}</StatusPill>
        <span className="text-lg font-bold tabular-nums">{formatCents(estimate.totalCents)}</span>
        <a
          className="font-bold underline underline-offset-4"
          href={estimatePdfPath(estimate.id)}
          target="_blank"
          rel="noreferrer"
        >
          Open the PDF
        </a>
      </div>
      {estimate.sentAt ? <p className="text-base text-ink-soft">Sent {formatWhen(estimate.sentAt)}</p> : null}
      {estimate.decidedAt ? (
        <p className="text-base">
          {estimate.status === 'approved' ? 'Approved' : 'Declined'} {formatWhen(estimate.decidedAt)}
          {estimate.decidedByName ? ` by ${estimate.decidedByName}` : ''}
          {estimate.decidedVia === 'owner_for_customer' ? ' for the customer' : ''}
          {estimate.decisionNote ? ` — “${estimate.decisionNote}”` : ''}
        </p>
      ) : null}
      {estimate.status === 'sent' && decide ? (
        <div className="grid gap-2">
          <FormField
            label={decide === 'owner' ? 'How the customer answered' : 'A word with your answer (optional)'}
            hint={decide === 'owner' ? 'e.g. “Yes by phone, 2:05 pm”' : undefined}
            value={note}
            maxLength={500}
            onChange={(event) => setNote(event.target.value)}
          />
          <div className="flex flex-wrap gap-3">
            <Button disabled={decision.isPending || noteNeeded} onClick={() => answer('approve')}>
              {decide === 'owner' ? 'Record an approval' : 'Approve the work'}
            </Button>
            <Button
              variant="secondary"
              disabled={decision.isPending || noteNeeded}
              onClick={() => answer('decline')}
            >
              {decide === 'owner' ? 'Record a decline' : 'Decline'}
            </Button>
          </div>
          <MutationStatus
            mutation={decision}
            success="Answer recorded."
            failure="The answer was not recorded."
          />
        </div>
      ) : null}
    </li>
  );
}

function Report({ jobId, maySend }: { jobId: number; maySend: boolean }) {
  const send = useSendReport(jobId);
  const alreadySent = send.error !== null && 'status' in send.error && send.error.status === 409;
  return (
    <div className="mt-4 grid gap-3 border-t-2 border-rule pt-3">
      <h3 className="text-lg font-bold">Diagnostic report</h3>
      <p className="max-w-prose text-base text-ink-soft">
        What was measured against which limit, each verdict in plain words, the pressure-hold chart and the
        safety notes.
      </p>
      <div className="flex flex-wrap gap-3">
        <a
          className={buttonClasses('secondary')}
          href={jobReportPdfPath(jobId)}
          target="_blank"
          rel="noreferrer"
        >
          Open the report (PDF)
        </a>
        {maySend ? (
          <Button disabled={send.isPending} onClick={() => send.mutate(alreadySent)}>
            {send.isPending ? 'Sending…' : alreadySent ? 'Send it again' : 'E-mail it to the customer'}
          </Button>
        ) : null}
      </div>
      {maySend ? (
        <MutationStatus
          mutation={send}
          success={
            send.data?.status === 'sent'
              ? `Report sent to ${send.data.to}.`
              : `Not gone yet${send.data?.lastError ? ` (the mail server said: ${send.data.lastError})` : ''}: it is tried again on its own until it goes.`
          }
          failure="The report was not sent."
        />
      ) : null}
    </div>
  );
}
