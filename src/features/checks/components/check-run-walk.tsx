import { useEffect, useMemo, useRef, useState } from 'react';
import { Link } from 'react-router';
import type { CheckRun } from '../../../../shared/api/checks';
import { isAllowed } from '../../../../shared/api/policy';
import type { Role } from '../../../../shared/api/users';
import type { Verdict } from '../../../../shared/api/readings';
import { buttonClasses } from '../../../components/ui/button';
import { AlertPanel } from '../../../components/ui/alert-panel';
import { Button } from '../../../components/ui/button';
import { PageHeading } from '../../../components/ui/page-heading';
import { Panel } from '../../../components/ui/panel';
import { StatusPill } from '../../../components/ui/status-pill';
import { pathTo } from '../../../app/paths';
import { useAnswerCheckStep, useBackCheckStep, usePauseCheckRun } from '../api/mutations';
import { useCheckJobContext, useCheckRun } from '../api/queries';
import { draftOfAnswer, procedureOfRun, stateOfRun, type Draft } from '../walk';
import { failureText } from './failure-text';
import { ApplyLines, RunOutcome } from './run-outcome';
import { RUN_STATUS_WORDS } from './run-status';
import { StepForm } from './step-form';
import { StepRecord } from './step-record';
import { VerdictPill } from './verdict-pill';

type Saved = {
  seq: number;
  title: string;
  verdict: Verdict | null;
  reason: string | null;
  differed: boolean;
};

/**
 * One guided-check run in the browser: walked step by step where it is open and the person may
 * answer (started here or in the van, paused or not), read-only once finished. The form judges
 * as it is typed; every step is saved to the server, whose verdict is shown as the record.
 */
export function CheckRunWalk({ jobId, runId, role }: { jobId: number; runId: number; role: Role }) {
  const run = useCheckRun(jobId, runId);
  if (run.isPending) {
    return (
      <p role="status" className="text-lg text-ink-soft">
        Loading check {runId}…
      </p>
    );
  }
  if (run.isError) {
    return (
      <>
        <PageHeading title={`Check ${runId}`} />
        <AlertPanel title="The check could not be loaded">
          <p>{failureText(run.error)}</p>
          <Button className="mt-4" onClick={() => void run.refetch()} disabled={run.isFetching}>
            {run.isFetching ? 'Trying again…' : 'Try again'}
          </Button>
        </AlertPanel>
      </>
    );
  }
  return <RunPage run={run.data} role={role} />;
}

function RunPage({ run, role }: { run: CheckRun; role: Role }) {
  const context = useCheckJobContext(run.jobId);
  const procedure = procedureOfRun(run);
  const state = useMemo(() => (procedure ? stateOfRun(procedure, run) : null), [procedure, run]);
  const answer = useAnswerCheckStep(run.jobId, run.id);
  const back = useBackCheckStep(run.jobId, run.id);
  const pause = usePauseCheckRun(run.jobId, run.id);
  const [saved, setSaved] = useState<Saved | null>(null);
  const [prefill, setPrefill] = useState<{ seq: number; stepKey: string; draft: Draft } | null>(null);
  const findingsHeading = useRef<HTMLDivElement>(null);
  const wasFinished = useRef(run.finished);

  // Finishing here moves focus to the findings, as each new step's heading takes it before.
  useEffect(() => {
    if (run.finished && !wasFinished.current) findingsHeading.current?.focus();
    wasFinished.current = run.finished;
  }, [run.finished]);

  const mayAnswer = isAllowed(role, 'checks', 'update');
  const step = procedure && run.current ? procedure.steps[run.current.key] : undefined;
  const open = !run.finished && run.status !== 'abandoned';
  // The limits the run started with, as the server judges it (a later machine edit changes nothing).
  const spec = run.spec;
  const lastError = answer.error ?? back.error ?? pause.error;
  const busy = answer.isPending ? 'saving' : back.isPending ? 'backing' : pause.isPending ? 'pausing' : null;

  // One line of trouble at a time: the refusal of the request just made, not of an earlier one.
  const startRequest = () => {
    answer.reset();
    back.reset();
    pause.reset();
    setSaved(null);
  };

  const onBack = () => {
    const last = run.steps.at(-1);
    const definition = last && procedure?.steps[last.stepKey];
    startRequest();
    back.mutate(undefined, {
      onSuccess: () => {
        if (last && definition)
          setPrefill({ seq: last.seq, stepKey: last.stepKey, draft: draftOfAnswer(definition, last.answer) });
      },
    });
  };

  return (
    <>
      <PageHeading title={run.title}>
        Job {run.jobId}
        {context.data ? ` · ${context.data.machineName} · ${context.data.customerName}` : ''} · check {run.id}
      </PageHeading>
      <div className="mb-6 flex flex-wrap items-center gap-3">
        <StatusPill tone={run.status === 'finished' ? 'pass' : 'quiet'}>
          {RUN_STATUS_WORDS[run.status]}
        </StatusPill>
        {run.finished ? null : (
          <span className="flex items-center gap-2 text-base">
            Worst so far: <VerdictPill verdict={run.verdictSoFar} />
          </span>
        )}
        <Link to={pathTo.job(run.jobId)} className={buttonClasses('secondary')}>
          Back to job {run.jobId}
        </Link>
      </div>

      <div className="grid max-w-4xl gap-6">
        {saved ? <SavedNote saved={saved} /> : null}
        {run.status === 'paused' ? (
          <Panel>
            <p className="text-lg" role="status">
              <span className="font-bold">Paused at step {run.steps.length + 1}.</span> Carry on here, or in
              the van with{' '}
              <code className="font-mono font-bold">
                vanbay check resume {run.jobId} {run.id}
              </code>
              .
            </p>
          </Panel>
        ) : null}
        {context.isError && open && mayAnswer ? (
          <p className="text-base text-ink-soft">
            The machine’s limits could not be read, so answers are judged here by the generic limits (confirm
            in the service manual). The server judges every saved step by the limits the check started with.
          </p>
        ) : null}

        {open && mayAnswer && procedure && state && step ? (
          <StepForm
            key={`${run.id}-${run.steps.length}-${step.key}`}
            number={run.steps.length + 1}
            procedure={procedure}
            state={state}
            step={step}
            caution={run.current?.caution ?? null}
            spec={spec}
            initialDraft={
              prefill && prefill.seq === run.steps.length && prefill.stepKey === step.key
                ? prefill.draft
                : undefined
            }
            canGoBack={run.steps.length > 0}
            busy={busy}
            error={lastError ? failureText(lastError) : null}
            onSave={(input, live) => {
              startRequest();
              setPrefill(null);
              answer.mutate(input, {
                onSuccess: (next) => {
                  const stored = next.steps.at(-1);
                  const liveVerdict = live.state === 'judged' ? (live.evaluation?.verdict ?? null) : null;
                  if (stored) {
                    setSaved({
                      seq: stored.seq,
                      title: stored.title,
                      verdict: stored.evaluation?.verdict ?? null,
                      reason: stored.evaluation?.reason ?? null,
                      differed: (stored.evaluation?.verdict ?? null) !== liveVerdict,
                    });
                  }
                },
              });
            }}
            onBack={onBack}
            onPause={() => {
              startRequest();
              pause.mutate();
            }}
          />
        ) : null}
        {open && !mayAnswer ? (
          <Panel>
            <p className="text-lg">
              This check is still under way in the workshop; its findings come when it is finished.
            </p>
          </Panel>
        ) : null}
        {open && mayAnswer && !procedure ? (
          <AlertPanel title="This dashboard cannot walk this check">
            <p>
              It was made with {run.procedureKey} version {run.procedureVersion}, which this dashboard does
              not have. Carry on from the van with the CLI that started it.
            </p>
          </AlertPanel>
        ) : null}

        {run.outcome ? (
          <Panel>
            <div ref={findingsHeading} tabIndex={-1} className="grid gap-4">
              <RunOutcome outcome={run.outcome} />
              {isAllowed(role, 'lineItems', 'create') ? (
                <ApplyLines run={run} jobStatus={context.data?.jobStatus} />
              ) : null}
            </div>
          </Panel>
        ) : null}

        {run.steps.length > 0 ? (
          <Panel>
            <h2 className="text-xl font-bold">
              {run.finished ? 'Each step' : 'Answered so far'} ({run.steps.length})
            </h2>
            <ol className="mt-3 grid gap-5">
              {run.steps.map((s) => (
                <li key={s.seq} className="border-t-2 border-rule pt-4 first:border-t-0 first:pt-0">
                  <StepRecord step={s} procedure={procedure} />
                </li>
              ))}
            </ol>
          </Panel>
        ) : null}
      </div>
    </>
  );
}

/** What the server kept of the step just saved: its own verdict, said once, politely. */
function SavedNote({ saved }: { saved: Saved }) {
  return (
    <div role="status" className="rounded-plate border-2 border-ink bg-panel p-4 text-lg">
      <p className="flex flex-wrap items-center gap-2">
        <span className="font-bold">
          Saved step {saved.seq + 1}, {saved.title}. The server’s verdict:
        </span>
        <VerdictPill verdict={saved.verdict} />
      </p>
      {saved.reason ? <p className="mt-1">{saved.reason}</p> : null}
      {saved.differed ? (
        <p className="mt-1 font-bold">
          This differs from the verdict judged here: the server judges by the limits the check started with,
          and its verdict is the record.
        </p>
      ) : null}
    </div>
  );
}
