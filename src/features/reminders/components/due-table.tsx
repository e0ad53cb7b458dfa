import { useMemo } from 'react';
import type { ReactNode } from 'react';
import { Link } from 'react-router';
import type { DueItem, IntervalStatus } from '../../../../shared/api/reminders';
import { Button } from '../../../components/ui/button';
import { dataColumns, DataTable } from '../../../components/ui/data-table';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { intervalStatusShown } from '../../../components/ui/interval-status';
import { StatusPill } from '../../../components/ui/status-pill';
import { toneClasses, toneGlyphs } from '../../../components/ui/tone';
import type { Tone } from '../../../components/ui/tone';
import { errorText, isWaitingMail } from '../../../lib/error-text';
import { formatCalendarDate, formatDecimal, formatInstant } from '../../../lib/format';
import { useSendReminder } from '../api/mutations';
import { useDueList } from '../api/queries';
import type { DueFilter } from '../api/queries';

const URGENCY: Record<IntervalStatus, number> = { overdue: 0, due: 1, due_soon: 2, ok: 3 };

/**
 * Most urgent first among the rows fetched so far: by status, then by how far past (or how near)
 * the date is. The server pages by interval, so a later page can still hold an overdue item.
 */
function byUrgency(a: DueItem, b: DueItem): number {
  return (
    URGENCY[a.status] - URGENCY[b.status] ||
    (a.remaining.days ?? Number.POSITIVE_INFINITY) - (b.remaining.days ?? Number.POSITIVE_INFINITY) ||
    b.serviceIntervalId - a.serviceIntervalId
  );
}

export type DueLinks = {
  machine: (id: number) => string;
  customer: (id: number) => string;
};

type DueTableProps = {
  filter: DueFilter;
  links: DueLinks;
  /** The owner sends reminders (shared/api/policy.ts: reminders create and update). */
  canSend: boolean;
  empty: ReactNode;
};

const col = dataColumns<DueItem>();

/** The service items coming due, with each customer's reminder and the button that mails it. */
export function DueTable({ filter, links, canSend, empty }: DueTableProps) {
  const due = useDueList(filter);
  const rows = useMemo(() => (due.data ? [...due.data].sort(byUrgency) : []), [due.data]);
  const columns = useMemo(
    () =>
      col.columns([
        col.accessor((item) => `${item.machine.make} ${item.machine.model}`, {
          id: 'machine',
          header: 'Machine and owner',
          meta: { rowHeader: true },
          cell: ({ row }) => (
            <>
              <Link
                to={links.machine(row.original.machine.id)}
                className="block font-bold text-coolant underline underline-offset-4"
              >
                {row.original.machine.make} {row.original.machine.model}
              </Link>
              <Link
                to={links.customer(row.original.customer.id)}
                className="font-medium text-ink-soft underline underline-offset-4"
              >
                {row.original.customer.name}
              </Link>
            </>
          ),
        }),
        col.accessor('label', {
          header: 'Service',
          cell: ({ row }) => (
            <div className="grid gap-1 font-normal">
              <span className="font-bold">{row.original.label}</span>
              <span>
                <StatusPill tone={intervalStatusShown[row.original.status].tone}>
                  {intervalStatusShown[row.original.status].word}
                </StatusPill>
              </span>
              <span className="max-w-prose text-base text-ink-soft">{row.original.reason}</span>
            </div>
          ),
        }),
        col.accessor((item) => item.dueOn ?? '', {
          id: 'due',
          header: 'Due',
          cell: ({ row }) => <DueWhen item={row.original} />,
        }),
        col.display({
          id: 'reminder',
          header: 'Reminder',
          cell: ({ row }) =>
            canSend ? <SendReminder item={row.original} /> : <ReminderState item={row.original} />,
        }),
      ]),
    [links, canSend],
  );

  if (due.isPending) return <Loading>Loading what is due…</Loading>;
  if (due.isError) {
    return (
      <LoadFailure
        title="The due list could not be loaded"
        error={due.error}
        onRetry={() => void due.refetch()}
        retrying={due.isFetching}
      />
    );
  }
  return (
    <DataTable
      caption="Service items due"
      hideCaption
      columns={columns}
      rows={rows}
      getRowId={(item) => String(item.serviceIntervalId)}
      paging={due}
      moreLabel="Show more"
      empty={empty}
    />
  );
}

/** The limit that decides first in bold, then the other: due by date or meter, whichever comes first. */
function DueWhen({ item }: { item: DueItem }) {
  const date = item.dueOn === null ? null : formatCalendarDate(item.dueOn);
  const meter =
    item.dueAtMeter === null ? null : `at ${formatDecimal(item.dueAtMeter, 1)} ${item.machine.meterUnit}`;
  const meterFirst = (item.dueBy === 'distance' || item.dueBy === 'hours') && meter !== null;
  const [first, second] = meterFirst ? [meter, date] : [date, meter];
  return (
    <>
      {first ? <span className="block font-bold whitespace-nowrap">{first}</span> : null}
      {second ? <span className="block whitespace-nowrap text-ink-soft">or {second}</span> : null}
    </>
  );
}

function reminderWords(item: DueItem): string {
  const reminder = item.reminder;
  if (!reminder) return 'Not reminded yet.';
  switch (reminder.status) {
    case 'pending':
      return 'Written, not sent yet.';
    case 'sent':
      return reminder.sentAt ? `Sent ${formatInstant(reminder.sentAt)}.` : 'Sent.';
    case 'dismissed':
      return 'Dismissed.';
    case 'done':
      return 'Marked done.';
  }
}

function ReminderState({ item }: { item: DueItem }) {
  return <span>{reminderWords(item)}</span>;
}

/** One row's send: its own pending, success and failure, so two sends never share a message. */
function SendReminder({ item }: { item: DueItem }) {
  const send = useSendReminder();
  const who = item.customer.name;
  if (!item.customer.email) {
    return (
      <div className="grid gap-1">
        <ReminderState item={item} />
        <span className="text-base font-bold text-warn">
          No e-mail on file for {who}: add one to mail a reminder.
        </span>
      </div>
    );
  }
  const again = item.reminder?.status === 'sent';
  const mail = send.data;
  return (
    <div className="grid min-w-56 gap-2">
      <ReminderState item={item} />
      <Button
        variant={again ? 'secondary' : 'primary'}
        disabled={send.isPending}
        onClick={() => send.mutate({ item })}
        aria-label={`${again ? 'Send again' : 'Send reminder'}: ${item.label}, ${item.machine.make} ${item.machine.model}, to ${who}`}
      >
        {send.isPending ? 'Sending…' : again ? 'Send again' : 'Send reminder'}
      </Button>
      <div aria-live="polite">
        {send.isError && isWaitingMail(send.error) ? (
          <div className="grid gap-2">
            <Outcome tone="warn">
              Its mail is waiting in the outbox and is tried again on its own.
            </Outcome>
            <Button
              variant="secondary"
              className="justify-self-start"
              onClick={() => send.mutate({ item, again: true })}
              aria-label={`Try it now: ${item.label}, ${item.machine.make} ${item.machine.model}, to ${who}`}
            >
              Try it now
            </Button>
          </div>
        ) : send.isError ? (
          <Outcome tone="fail">Not sent. {errorText(send.error)}</Outcome>
        ) : mail?.status === 'failed' ? (
          <Outcome tone="warn">
            The mail server refused it{mail.lastError ? ` (${mail.lastError})` : ''}; it is retried on its
            own.
          </Outcome>
        ) : mail ? (
          <Outcome tone="pass">
            {mail.status === 'sent' ? 'Sent' : 'Queued'} to {mail.to}.
          </Outcome>
        ) : null}
      </div>
    </div>
  );
}

function Outcome({ tone, children }: { tone: Tone; children: ReactNode }) {
  return (
    <p className={`flex gap-2 rounded-plate border-2 px-3 py-2 text-base font-bold ${toneClasses[tone]}`}>
      <span aria-hidden="true">{toneGlyphs[tone]}</span>
      <span>{children}</span>
    </p>
  );
}
