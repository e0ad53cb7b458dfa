import { useQueries } from '@tanstack/react-query';
import { Link } from 'react-router';
import type { CheckRun, CheckRunSummary } from '../../../../shared/api/checks';
import { isAllowed } from '../../../../shared/api/policy';
import { Panel } from '../../../components/ui/panel';
import { StatusPill } from '../../../components/ui/status-pill';
import { buttonClasses } from '../../../components/ui/button';
import { formatInstant } from '../../../lib/format';
import { pathTo } from '../../../app/paths';
import { useSessionUser } from '../../session/api/queries';
import { checkQueries, useCheckRuns } from '../api/queries';
import { newRunSearch, STARTABLE } from '../procedures';
import { procedureOfRun } from '../walk';
import { failureText } from './failure-text';
import { RunOutcome } from './run-outcome';
import { RUN_STATUS_WORDS } from './run-status';
import { StepRecord } from './step-record';
import { VerdictPill } from './verdict-pill';

/**
 * A job's guided checks for its page: each run with its status, every step's verdict and reason,
 * the findings, and the pressure-over-time chart of a hold; buttons to start a check (the
 * workshop's) and to carry on with one left open.
 */
export function CheckRunsPanel({ jobId }: { jobId: number }) {
  const { role } = useSessionUser();
  const runs = useCheckRuns(jobId);
  const canStart = isAllowed(role, 'checks', 'create');
  const canContinue = isAllowed(role, 'checks', 'update');
  const details = useQueries({
    queries: (runs.data ?? []).map((run) => checkQueries.detail(jobId, run.id)),
  });

  return (
    <Panel>
      <h2 className="text-xl font-bold">Guided checks</h2>
      {canStart ? (
        <div className="mt-3 flex flex-wrap gap-3">
          {STARTABLE.map((procedure) => (
            <Link
              key={procedure.key}
              to={`${pathTo.checkRun(jobId, 'new')}${newRunSearch(procedure.key)}`}
              className={buttonClasses('secondary')}
            >
              Start {procedure.title.toLowerCase()}
            </Link>
          ))}
        </div>
      ) : null}
      {runs.isPending ? (
        <p role="status" className="mt-3 text-lg text-ink-soft">
          Loading the checks…
        </p>
      ) : runs.isError ? (
        <p role="alert" className="mt-3 text-lg font-bold text-fail">
          The checks could not be loaded: {failureText(runs.error)}
        </p>
      ) : runs.data.length === 0 ? (
        <p className="mt-3 text-lg text-ink-soft">
          No guided check on this job yet.{canStart ? ' Start one above, or from the van with ' : ''}
          {canStart ? <code className="font-mono font-bold">vanbay check run {jobId} fuel</code> : null}
          {canStart ? '.' : ''}
        </p>
      ) : (
        <ol className="mt-4 grid gap-4">
          {runs.data.map((summary, i) => (
            <li key={summary.id}>
              <RunCard
                summary={summary}
                detail={details[i]?.data}
                detailError={details[i]?.error ?? null}
                newest={i === 0}
                canContinue={canContinue}
              />
            </li>
          ))}
        </ol>
      )}
    </Panel>
  );
}

function RunCard({
  summary,
  detail,
  detailError,
  newest,
  canContinue,
}: {
  summary: CheckRunSummary;
  detail: CheckRun | undefined;
  detailError: Error | null;
  newest: boolean;
  canContinue: boolean;
}) {
  const open = summary.status === 'in_progress' || summary.status === 'paused';
  const procedure = detail ? procedureOfRun(detail) : null;
  const link = pathTo.checkRun(summary.jobId, summary.id);
  return (
    <article className="grid gap-3 rounded-plate border-2 border-rule p-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h3 className="text-lg font-bold">
            <Link to={link} className="underline decoration-2 underline-offset-4">
              {summary.title}, check {summary.id}
            </Link>
          </h3>
          <p className="text-base text-ink-soft">Started {formatInstant(summary.startedAt, 'dayTime')}</p>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <StatusPill tone={summary.status === 'finished' ? 'pass' : 'quiet'}>
            {RUN_STATUS_WORDS[summary.status]}
          </StatusPill>
          {summary.status === 'finished' ? <VerdictPill verdict={summary.verdict} /> : null}
        </div>
      </div>
      {open && canContinue ? (
        <Link to={link} className={`justify-self-start ${buttonClasses()}`}>
          Continue check {summary.id}
          {detail ? ` at step ${detail.steps.length + 1}` : ''}
        </Link>
      ) : null}
      {detailError ? (
        <p role="alert" className="text-base font-bold text-fail">
          Its steps could not be loaded: {failureText(detailError)}
        </p>
      ) : !detail ? (
        <p className="text-base text-ink-soft">Loading its steps…</p>
      ) : (
        <>
          {detail.outcome ? <RunOutcome outcome={detail.outcome} headingLevel={3} /> : null}
          {detail.steps.length > 0 ? (
            <details open={newest} className="grid gap-3">
              <summary className="flex min-h-touch cursor-pointer items-center text-lg font-bold">
                {stepsSummary(detail)}
              </summary>
              <ol className="mt-2 grid gap-4">
                {detail.steps.map((step) => (
                  <li key={step.seq} className="border-t-2 border-rule pt-3 first:border-t-0 first:pt-0">
                    <StepRecord step={step} procedure={procedure} headingLevel={4} />
                  </li>
                ))}
              </ol>
            </details>
          ) : (
            <p className="text-base text-ink-soft">No step answered yet.</p>
          )}
        </>
      )}
    </article>
  );
}

/** "11 steps: 8 pass, 1 warn, 2 fail" — the run at a glance before it is opened. */
function stepsSummary(run: CheckRun): string {
  const count = { pass: 0, warn: 0, fail: 0 };
  for (const step of run.steps) if (step.evaluation) count[step.evaluation.verdict] += 1;
  const parts = (['pass', 'warn', 'fail'] as const)
    .filter((v) => count[v] > 0)
    .map((v) => `${count[v]} ${v}`);
  const steps = `${run.steps.length} step${run.steps.length === 1 ? '' : 's'}`;
  return parts.length > 0 ? `${steps}: ${parts.join(', ')}` : steps;
}
