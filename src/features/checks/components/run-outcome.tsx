import type { CheckOutcome, CheckRun } from '../../../../shared/api/checks';
import { BILLING_JOB_STATUSES, JOB_STATUS_LABELS } from '../../../../shared/api/jobs';
import type { JobStatus, LineItemKind } from '../../../../shared/api/jobs';
import { Button } from '../../../components/ui/button';
import { formatDecimal } from '../../../lib/format';
import { useApplyCheckLines } from '../api/mutations';
import { failureText } from './failure-text';
import { VerdictPill } from './verdict-pill';

const KIND_WORDS: Record<LineItemKind, string> = {
  labour: 'Labour',
  part: 'Part',
  trip: 'Trip',
  supplies: 'Supplies',
  other: 'Other',
};

const quantityText = (kind: string, quantity: number) =>
  kind === 'labour' ? `${formatDecimal(quantity, 2)} h` : `× ${formatDecimal(quantity, 3)}`;

/** What a finished run concluded: findings worst first, probable causes, the next action, lines, advice. */
export function RunOutcome({ outcome, headingLevel = 2 }: { outcome: CheckOutcome; headingLevel?: 2 | 3 }) {
  const Heading = headingLevel === 2 ? 'h2' : 'h3';
  const Sub = headingLevel === 2 ? 'h3' : 'h4';
  const causes = outcome.diagnosis?.causes.slice(0, 3) ?? [];
  return (
    <div className="grid gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <Heading className="text-xl font-bold">Findings</Heading>
        <VerdictPill verdict={outcome.verdict} />
      </div>
      {outcome.findings.length === 0 ? (
        <p className="text-lg">No finding raised.</p>
      ) : (
        <ul className="grid gap-3">
          {outcome.findings.map((finding) => (
            <li key={finding.key} className="rounded-plate border-2 border-rule p-3">
              <div className="flex flex-wrap items-center justify-between gap-2">
                <Sub className="text-lg font-bold">{finding.title}</Sub>
                <VerdictPill verdict={finding.verdict} />
              </div>
              <p className="mt-1 text-base">{finding.detail}</p>
              <p className="mt-1 text-base">
                <span className="font-bold">Then: </span>
                {finding.nextAction}
              </p>
            </li>
          ))}
        </ul>
      )}
      {causes.length > 0 ? (
        <div>
          <Sub className="text-lg font-bold">Probable causes, most likely first</Sub>
          <ol className="mt-1 grid list-decimal gap-1 pl-6 text-base">
            {causes.map((cause) => (
              <li key={cause.cause}>
                <span className="font-bold">{cause.title}</span> ({cause.likelihood}):{' '}
                {cause.evidence.filter((e) => !e.startsWith('Against')).join('; ')}
              </li>
            ))}
          </ol>
        </div>
      ) : null}
      <p className="text-lg">
        <span className="font-bold">Next: </span>
        {outcome.nextAction}
      </p>
      {outcome.lines.length > 0 ? (
        <div>
          <Sub className="text-lg font-bold">Suggested lines</Sub>
          <ul className="mt-1 grid gap-1 text-base">
            {outcome.lines.map((line) => (
              <li key={`${line.kind}-${line.description}`} className="flex flex-wrap gap-x-3">
                <span className="w-20 font-bold">{KIND_WORDS[line.kind]}</span>
                <span>{line.description}</span>
                <span className="tabular-nums">{quantityText(line.kind, line.quantity)}</span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {outcome.advice.length > 0 ? (
        <ul className="grid list-disc gap-1 pl-6 text-base text-ink-soft">
          {outcome.advice.map((advice) => (
            <li key={advice}>{advice}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

/**
 * The owner's offer to put the suggested lines on the job: labour at the business's rate, parts
 * to be priced before invoicing. Once added, it says so instead.
 */
export function ApplyLines({ run, jobStatus }: { run: CheckRun; jobStatus: JobStatus | undefined }) {
  const apply = useApplyCheckLines(run.jobId, run.id);
  if (!run.outcome || run.outcome.lines.length === 0) return null;
  if (run.linesApplied) {
    return <p className="text-base font-bold">These lines are on job {run.jobId}.</p>;
  }
  // A billed job keeps its lines as invoiced; the server would refuse, so nothing is offered.
  if (jobStatus && (BILLING_JOB_STATUSES as readonly JobStatus[]).includes(jobStatus)) {
    return (
      <p className="text-base text-ink-soft">
        Job {run.jobId} is {JOB_STATUS_LABELS[jobStatus].toLowerCase()}: its lines stay as billed.
      </p>
    );
  }
  return (
    <div className="grid gap-2">
      <Button onClick={() => apply.mutate()} disabled={apply.isPending} className="justify-self-start">
        {apply.isPending ? 'Adding the lines…' : `Add these lines to job ${run.jobId}`}
      </Button>
      {apply.isSuccess ? (
        <p role="status" className="text-base">
          Added: labour at your rate{apply.data.note ? `; ${apply.data.note}` : ''}.
        </p>
      ) : null}
      {apply.isError ? (
        <p role="alert" className="text-base font-bold text-fail">
          Not added: {failureText(apply.error)}
        </p>
      ) : null}
    </div>
  );
}
