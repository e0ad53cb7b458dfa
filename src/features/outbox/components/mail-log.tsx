import { useState } from 'react';
import type { MailStatus, OutboxItem } from '../../../../shared/api/outbox';
import { dataColumns, DataTable } from '../../../components/ui/data-table';
import { EmptyState } from '../../../components/ui/empty-state';
import { SelectField } from '../../../components/ui/form-field';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { Panel } from '../../../components/ui/panel';
import { StatusPill } from '../../../components/ui/status-pill';
import type { Tone } from '../../../components/ui/tone';
import { countOf, formatInstant } from '../../../lib/format';
import { useOutbox } from '../api/queries';

/** What a mail's state means to the owner; a failed one is not lost, it waits for its next try. */
const MAIL_SHOWN: Record<MailStatus, { tone: Tone; word: string }> = {
  sent: { tone: 'pass', word: 'Sent' },
  failed: { tone: 'warn', word: 'Waiting to retry' },
  queued: { tone: 'quiet', word: 'Going out' },
};

const KIND_WORDS: Record<string, string> = {
  invoice: 'Invoice',
  reminder: 'Service reminder',
  report: 'Diagnostic report',
  estimate: 'Estimate',
};

const VIEWS = [
  { value: 'all', label: 'All mail' },
  { value: 'failed', label: 'Waiting to retry' },
  { value: 'queued', label: 'Going out' },
  { value: 'sent', label: 'Sent' },
] as const;
type View = (typeof VIEWS)[number]['value'];

const col = dataColumns<OutboxItem>();
const columns = col.columns([
  col.accessor('subject', {
    header: 'Mail',
    meta: { rowHeader: true },
    cell: ({ row }) => (
      <>
        <span className="block font-bold">{row.original.subject}</span>
        <span className="block font-normal text-ink-soft">
          {KIND_WORDS[row.original.kind] ?? row.original.kind} to {row.original.to}
        </span>
      </>
    ),
  }),
  col.accessor('status', {
    header: 'Where it is',
    cell: ({ row }) => {
      const mail = row.original;
      const shown = MAIL_SHOWN[mail.status];
      return (
        <div className="grid gap-1">
          <span>
            <StatusPill tone={shown.tone}>{shown.word}</StatusPill>
          </span>
          <span className="text-base text-ink-soft">
            {mail.sentAt
              ? `${formatInstant(mail.sentAt, 'dayTime')}${mail.attempts > 1 ? `, at the ${ordinal(mail.attempts)} try` : ''}`
              : `${countOf(mail.attempts, 'try', 'tries')} so far`}
          </span>
          {mail.status !== 'sent' && mail.lastError ? (
            <span className="max-w-prose text-base">The mail server said: {mail.lastError}</span>
          ) : null}
        </div>
      );
    },
  }),
  col.accessor('attachments', {
    header: 'Attached',
    meta: { hideOnPhone: true },
    cell: ({ getValue }) =>
      getValue().length === 0 ? (
        <span className="text-ink-soft">nothing</span>
      ) : (
        <ul className="grid gap-1">
          {getValue().map((file) => (
            <li key={file.filename} className="whitespace-nowrap">
              {file.filename}
            </li>
          ))}
        </ul>
      ),
  }),
]);

function ordinal(n: number): string {
  const tens = n % 100;
  const suffix = tens >= 11 && tens <= 13 ? 'th' : ({ 1: 'st', 2: 'nd', 3: 'rd' }[n % 10] ?? 'th');
  return `${n}${suffix}`;
}

/**
 * Every mail Vanbay sent for the business, newest first: what went, what waits for its next try
 * and why (the mail server's own words). Nothing here is lost: a mail that failed is tried again
 * on its own until it goes.
 */
export function MailLog() {
  const [view, setView] = useState<View>('all');
  const mail = useOutbox(view === 'all' ? null : view);
  return (
    <Panel>
      <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 className="text-xl font-bold">Mail</h2>
          <p className="mt-1 max-w-prose text-base text-ink-soft">
            Invoices, reminders, reports and estimates e-mailed from Vanbay. One that could not go yet is
            tried again on its own, with longer gaps, until it does.
          </p>
        </div>
        <SelectField
          label="Show"
          options={VIEWS}
          value={view}
          onChange={(event) => setView(event.target.value as View)}
        />
      </div>
      {mail.isPending ? (
        <Loading>Loading the mail…</Loading>
      ) : mail.isError && !mail.data ? (
        <LoadFailure
          title="The mail could not be loaded"
          error={mail.error}
          onRetry={() => void mail.refetch()}
          retrying={mail.isFetching}
        />
      ) : (
        <DataTable
          caption="Mail sent from Vanbay, newest first"
          hideCaption
          columns={columns}
          rows={mail.data}
          getRowId={(item) => String(item.id)}
          paging={mail}
          moreLabel="Show more mail"
          empty={
            <EmptyState title={view === 'all' ? 'No mail yet' : 'Nothing here'}>
              <p>
                {view === 'all'
                  ? 'Send an invoice, a reminder or a report and it shows here, with whether it went.'
                  : 'No mail is in this state just now.'}
              </p>
            </EmptyState>
          }
        />
      )}
    </Panel>
  );
}
