import { useState } from 'react';
import type { InvoiceDetail } from '../../../../shared/api/invoices';
import { Button, buttonClasses } from '../../../components/ui/button';
import { MutationStatus } from '../../../components/ui/mutation-status';
import { Panel } from '../../../components/ui/panel';
import { toneGlyphs } from '../../../components/ui/tone';
import { ApiError } from '../../../lib/api-client';
import { errorText, isWaitingMail } from '../../../lib/error-text';
import { formatCalendarDate } from '../../../lib/format';
import { localDay } from '../../../lib/calendar-days';
import { useCreatePaymentLink, useSendInvoice } from '../api/mutations';

/** E-mails the invoice with its PDF; once sent, only an explicit "send again" sends another copy. */
export function SendInvoice({ invoice }: { invoice: InvoiceDetail }) {
  const send = useSendInvoice(invoice.id);
  const sent = invoice.sentAt !== null;
  const to = send.data?.to;
  // Not sent yet, but a mail for it already waits in the outbox (its first attempt failed): the
  // server retries it on its own, and "try it now" makes that attempt at once, not a second copy.
  const waiting = isWaitingMail(send.error);
  return (
    <Panel>
      <h2 className="text-xl font-bold">E-mail to the customer</h2>
      <p className="mt-1 text-base text-ink-soft">
        {sent
          ? `Sent on ${formatCalendarDate(localDay(invoice.sentAt!))}, with the PDF attached.`
          : 'Sends the invoice to the customer’s e-mail address with the PDF attached.'}
      </p>
      <div className="mt-4 grid gap-3">
        <Button
          variant={sent ? 'secondary' : 'primary'}
          className="justify-self-start"
          disabled={send.isPending}
          onClick={() => send.mutate({ again: sent })}
        >
          {send.isPending ? 'Sending…' : sent ? 'Send it again' : 'Send the invoice'}
        </Button>
        <MutationStatus
          mutation={send}
          pending="Handing the mail to the outbox…"
          success={
            send.data?.status === 'sent'
              ? `Sent to ${to}.`
              : `Queued for ${to ?? 'the customer'}: the outbox retries until it goes.`
          }
          failure="Not sent."
        />
        {waiting ? (
          <Button
            variant="secondary"
            className="justify-self-start"
            onClick={() => send.mutate({ again: true })}
          >
            Try it now
          </Button>
        ) : null}
        {send.data?.paymentLinkError ? (
          <p className="text-base font-bold text-warn">
            <span aria-hidden="true">{toneGlyphs.warn} </span>
            The mail went without a card link: {send.data.paymentLinkError}
          </p>
        ) : null}
      </div>
    </Panel>
  );
}

type PaymentLinkProps = {
  invoice: InvoiceDetail;
  /** The owner may make a link; everyone who may read the invoice may open one. */
  canCreate: boolean;
};

/** The card payment page for this invoice: open it, copy it for a text message, or make one. */
export function PaymentLink({ invoice, canCreate }: PaymentLinkProps) {
  const create = useCreatePaymentLink(invoice.id);
  const url = invoice.paymentLinkUrl ?? create.data?.url ?? null;
  const open = invoice.status !== 'void' && invoice.balanceCents > 0;

  if (!url && (!canCreate || !open)) {
    if (canCreate) return null;
    return open ? (
      <Panel>
        <h2 className="text-xl font-bold">Pay by card</h2>
        <p className="mt-1 text-lg text-ink-soft">
          No card payment link has been made for this invoice yet. Ask the business for one, or pay as the
          invoice says.
        </p>
      </Panel>
    ) : null;
  }

  return (
    <Panel>
      <h2 className="text-xl font-bold">Pay by card</h2>
      {url ? (
        <div className="mt-3 grid gap-3">
          <p className="text-base break-all text-ink-soft">{url}</p>
          <div className="flex flex-wrap gap-3">
            <a
              href={url}
              target="_blank"
              rel="noopener noreferrer"
              className={buttonClasses(open ? 'primary' : 'secondary')}
            >
              Open the payment page
            </a>
            <CopyButton text={url} />
          </div>
        </div>
      ) : (
        <div className="mt-3 grid gap-3">
          <p className="text-base text-ink-soft">
            A link to a card payment page for the balance, to text or e-mail to the customer. It is printed on
            the PDF too.
          </p>
          <Button className="justify-self-start" disabled={create.isPending} onClick={() => create.mutate()}>
            {create.isPending ? 'Making the link…' : 'Make a payment link'}
          </Button>
          {create.error ? (
            <p role="alert" className="flex gap-2 text-base font-bold text-fail">
              <span aria-hidden="true">{toneGlyphs.fail}</span>
              <span>{linkFailure(create.error)}</span>
            </p>
          ) : (
            <MutationStatus mutation={create} success="Link made." pending="Asking the payment service…" />
          )}
        </div>
      )}
    </Panel>
  );
}

/** 404 and 503 mean card payments are not set up on this server: the server's message says how. */
function linkFailure(error: Error): string {
  if (error instanceof ApiError && (error.status === 404 || error.status === 503)) {
    return `Card links are not available: ${error.message}`;
  }
  return `No link was made. ${errorText(error)}`;
}

/** The clipboard needs a secure page (localhost or https); elsewhere it says so instead of failing silently. */
function CopyButton({ text }: { text: string }) {
  const [state, setState] = useState<'idle' | 'copied' | 'failed'>('idle');
  async function copy() {
    try {
      await navigator.clipboard.writeText(text);
      setState('copied');
    } catch {
      setState('failed');
    }
  }
  return (
    <span className="flex flex-wrap items-center gap-3">
      <Button variant="secondary" onClick={() => void copy()}>
        Copy the link
      </Button>
      <span role="status" className="text-base font-bold">
        {state === 'copied' ? <span className="text-pass">Copied.</span> : null}
        {state === 'failed' ? (
          <span className="text-fail">This browser would not copy it; select the link above instead.</span>
        ) : null}
      </span>
    </span>
  );
}
