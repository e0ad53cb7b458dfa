import { useMemo, useState } from 'react';
import { Link } from 'react-router';
import { JOB_STATUS_LABELS } from '../../../../shared/api/jobs';
import type { LineItem } from '../../../../shared/api/line-items';
import type { MachineHistoryJob, MeterUnit } from '../../../../shared/api/machines';
import type { Reading, Verdict } from '../../../../shared/api/readings';
import { findProcedure } from '../../../../shared/procedures/index';
import { findUnit, formatMeasurement } from '../../../../shared/units';
import { dataColumns, DataTable } from '../../../components/ui/data-table';
import { EmptyState } from '../../../components/ui/empty-state';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { StatusPill } from '../../../components/ui/status-pill';
import type { Tone } from '../../../components/ui/tone';
import { formatCents } from '../../../lib/money';
import { formatInstant } from '../../../lib/format';
import { useJobLineItems, useJobReadings, useMachineHistory } from '../api/queries';
import { meterText } from './machine-labels';

/** Where a visit and a check link to; null where this role has no page for them. */
export type HistoryLinks = {
  job: ((jobId: number) => string) | null;
  checkRun: ((jobId: number, runId: number) => string) | null;
};

type ServiceHistoryProps = {
  machineId: number;
  links: HistoryLinks;
  /** The policy's word on what this role may read: readings (workshop and customer), lines (staff). */
  showReadings: boolean;
  showLineItems: boolean;
  /** What to say when the machine has no jobs yet. */
  emptyHint: string;
};

const verdictShown: Record<Verdict, { tone: Tone; word: string }> = {
  pass: { tone: 'pass', word: 'Pass' },
  warn: { tone: 'warn', word: 'Warning' },
  fail: { tone: 'fail', word: 'Fail' },
};

const checkStatusWords = {
  in_progress: 'under way',
  paused: 'paused',
  finished: 'finished',
  abandoned: 'abandoned',
} as const;

/** Every visit to the machine, newest first: what was wrong, what was measured and judged, what was done. */
export function ServiceHistory({
  machineId,
  links,
  showReadings,
  showLineItems,
  emptyHint,
}: ServiceHistoryProps) {
  const history = useMachineHistory(machineId);
  if (history.isPending) return <Loading>Loading the service history…</Loading>;
  if (history.isError) {
    return (
      <LoadFailure
        title="The service history could not be loaded"
        error={history.error}
        onRetry={() => void history.refetch()}
        retrying={history.isFetching}
      />
    );
  }
  const { jobs, meterUnit } = history.data;
  if (jobs.length === 0) {
    return (
      <EmptyState title="No visits recorded yet">
        <p>{emptyHint}</p>
      </EmptyState>
    );
  }
  return (
    <ol className="grid gap-4" aria-label="Visits, newest first">
      {jobs.map((job) => (
        <li key={job.id}>
          <HistoryJob
            machineId={machineId}
            job={job}
            meterUnit={meterUnit}
            links={links}
            showReadings={showReadings}
            showLineItems={showLineItems}
          />
        </li>
      ))}
    </ol>
  );
}

type HistoryJobProps = {
  machineId: number;
  job: MachineHistoryJob;
  meterUnit: MeterUnit;
  links: HistoryLinks;
  showReadings: boolean;
  showLineItems: boolean;
};

function HistoryJob({ machineId, job, meterUnit, links, showReadings, showLineItems }: HistoryJobProps) {
  const [open, setOpen] = useState(false);
  const when = job.completedAt ?? job.scheduledAt;
  const meter = meterText(job.meterReading, meterUnit);
  const records = [showReadings ? 'readings' : null, showLineItems ? 'line items' : null].filter(Boolean);
  return (
    <article
      className="rounded-plate border-2 border-rule bg-panel p-5"
      aria-labelledby={`job-${job.id}-title`}
    >
      <header className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-2">
        <h3 id={`job-${job.id}-title`} className="text-xl font-bold">
          {when ? formatInstant(when) : 'Not yet scheduled'}
          {meter ? <span className="font-medium text-ink-soft"> · {meter}</span> : null}
        </h3>
        <div className="flex flex-wrap items-center gap-3">
          <StatusPill tone="quiet">{JOB_STATUS_LABELS[job.status]}</StatusPill>
          {links.job ? (
            <Link
              to={links.job(job.id)}
              className="min-h-touch content-center font-bold text-coolant underline underline-offset-4"
            >
              Job {job.id}
            </Link>
          ) : (
            <span className="font-bold text-ink-soft">Job {job.id}</span>
          )}
        </div>
      </header>
      <dl className="mt-3 grid gap-2 text-lg">
        <JobText term="Complaint" text={job.complaint} />
        {job.diagnosis ? <JobText term="Found" text={job.diagnosis} /> : null}
        {job.workDone ? <JobText term="Done" text={job.workDone} /> : null}
      </dl>
      {job.checks.length > 0 ? (
        <ul className="mt-4 grid gap-2" aria-label={`Checks on job ${job.id}`}>
          {job.checks.map((check) => (
            <li key={check.id} className="flex flex-wrap items-center gap-3">
              {check.verdict ? (
                <StatusPill tone={verdictShown[check.verdict].tone}>
                  {verdictShown[check.verdict].word}
                </StatusPill>
              ) : (
                <StatusPill tone="quiet">No verdict</StatusPill>
              )}
              {links.checkRun ? (
                <Link
                  to={links.checkRun(job.id, check.id)}
                  className="min-h-touch content-center font-bold text-coolant underline underline-offset-4"
                >
                  {procedureTitle(check.procedureKey)}
                </Link>
              ) : (
                <span className="font-bold">{procedureTitle(check.procedureKey)}</span>
              )}
              <span className="text-ink-soft">
                {checkStatusWords[check.status]}
                {check.finishedAt ? ` ${formatInstant(check.finishedAt)}` : ''}
              </span>
            </li>
          ))}
        </ul>
      ) : null}
      {records.length > 0 ? (
        <details className="group mt-4" onToggle={(event) => setOpen(event.currentTarget.open)}>
          <summary className="flex min-h-touch cursor-pointer list-none items-center gap-2 text-lg font-bold text-coolant">
            <span aria-hidden="true" className="inline-block transition-transform group-open:rotate-90">
              ▶
            </span>
            <span className="underline underline-offset-4">{capitalise(records.join(' and '))}</span>
          </summary>
          {open ? (
            <div className="mt-3 grid gap-4">
              {showReadings ? <JobReadings machineId={machineId} job={job} /> : null}
              {showLineItems ? <JobLineItems machineId={machineId} jobId={job.id} /> : null}
            </div>
          ) : null}
        </details>
      ) : null}
    </article>
  );
}

function JobText({ term, text }: { term: string; text: string }) {
  return (
    <div className="grid gap-x-3 sm:grid-cols-[7rem_minmax(0,1fr)]">
      <dt className="font-bold text-ink-soft">{term}</dt>
      <dd>{text}</dd>
    </div>
  );
}

function procedureTitle(key: string): string {
  return findProcedure(key)?.title ?? key;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

type ReadingRow = Reading & { stepTitle: string | null };

const readingCol = dataColumns<ReadingRow>();
const readingColumns = readingCol.columns([
  readingCol.accessor('quantity', {
    header: 'Measured',
    meta: { rowHeader: true },
    cell: ({ row }) => (
      <>
        <span className="block capitalize">{row.original.quantity}</span>
        {row.original.note ? (
          <span className="block font-medium text-ink-soft">{row.original.note}</span>
        ) : null}
      </>
    ),
  }),
  readingCol.accessor((reading) => readingText(reading), {
    id: 'value',
    header: 'Reading',
    meta: { align: 'end' },
    cell: ({ getValue }) => <span className="font-bold whitespace-nowrap">{getValue()}</span>,
  }),
  readingCol.accessor((reading) => reading.stepTitle ?? '', { id: 'step', header: 'Step' }),
  readingCol.display({
    id: 'verdict',
    header: 'Verdict',
    cell: ({ row }) => {
      const judgement = row.original.judgement;
      if (!judgement) return <span className="text-ink-soft">not judged</span>;
      return (
        <div className="grid gap-1">
          <span>
            <StatusPill tone={verdictShown[judgement.verdict].tone}>
              {verdictShown[judgement.verdict].word}
            </StatusPill>
          </span>
          <span className="max-w-prose text-base">{judgement.reason}</span>
        </div>
      );
    },
  }),
]);

/** As the mechanic typed it ("43 psi"), with the stored value beside it when the unit differs. */
function readingText(reading: Reading): string {
  const entered = findUnit(reading.enteredUnit);
  const typed = entered
    ? formatMeasurement(reading.enteredValue, entered, 2)
    : `${reading.enteredValue} ${reading.enteredUnit}`;
  if (reading.enteredUnit === reading.unit) return typed;
  const stored = findUnit(reading.unit);
  return stored ? `${typed} (${formatMeasurement(reading.value, stored, 1)})` : typed;
}

/** Each reading's step by its title in the check it was taken in ("Static pressure hold"). */
function withStepTitles(readings: Reading[], job: MachineHistoryJob): ReadingRow[] {
  const procedureOf = new Map(job.checks.map((check) => [check.id, check.procedureKey]));
  return readings.map((reading) => {
    const procedure = reading.checkRunId === null ? undefined : procedureOf.get(reading.checkRunId);
    const step = procedure && reading.stepKey ? findProcedure(procedure)?.steps[reading.stepKey] : undefined;
    return { ...reading, stepTitle: step?.title ?? reading.stepKey };
  });
}

function JobReadings({ machineId, job }: { machineId: number; job: MachineHistoryJob }) {
  const readings = useJobReadings(machineId, job.id);
  const rows = useMemo(() => withStepTitles(readings.data?.items ?? [], job), [readings.data, job]);
  if (readings.isPending) return <Loading>Loading the readings…</Loading>;
  if (readings.isError) {
    return (
      <LoadFailure
        title="The readings could not be loaded"
        error={readings.error}
        onRetry={() => void readings.refetch()}
        retrying={readings.isFetching}
      />
    );
  }
  return (
    <DataTable
      caption={`Readings on job ${job.id}`}
      columns={readingColumns}
      rows={rows}
      getRowId={(reading) => String(reading.id)}
      empty={<p className="text-lg text-ink-soft">No readings were taken on this visit.</p>}
    />
  );
}

const lineCol = dataColumns<LineItem>();
const lineColumns = lineCol.columns([
  lineCol.accessor('description', {
    header: 'Line',
    meta: { rowHeader: true },
    cell: ({ row }) => (
      <>
        <span className="block">{row.original.description}</span>
        {row.original.partNumber ? (
          <span className="block font-mono font-medium text-ink-soft">{row.original.partNumber}</span>
        ) : null}
      </>
    ),
  }),
  lineCol.accessor('kind', {
    header: 'Kind',
    cell: ({ getValue }) => <span className="capitalize">{getValue()}</span>,
  }),
  lineCol.accessor('quantity', { header: 'Qty', meta: { align: 'end' } }),
  lineCol.accessor('lineTotalCents', {
    header: 'Amount',
    meta: { align: 'end' },
    cell: ({ row }) =>
      row.original.needsPrice ? (
        <span className="font-bold text-warn">needs a price</span>
      ) : (
        <span className="whitespace-nowrap">{formatCents(row.original.lineTotalCents)}</span>
      ),
  }),
]);

function JobLineItems({ machineId, jobId }: { machineId: number; jobId: number }) {
  const lines = useJobLineItems(machineId, jobId);
  if (lines.isPending) return <Loading>Loading the line items…</Loading>;
  if (lines.isError) {
    return (
      <LoadFailure
        title="The line items could not be loaded"
        error={lines.error}
        onRetry={() => void lines.refetch()}
        retrying={lines.isFetching}
      />
    );
  }
  return (
    <DataTable
      caption={`Line items on job ${jobId}, before tax`}
      columns={lineColumns}
      rows={lines.data.items}
      getRowId={(line) => String(line.id)}
      empty={<p className="text-lg text-ink-soft">No line items on this visit.</p>}
    />
  );
}
