import { zodResolver } from '@hookform/resolvers/zod';
import { useMemo, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { PAYMENT_METHODS } from '../../../../shared/api/invoices';
import type { InvoiceDetail } from '../../../../shared/api/invoices';
import { Button } from '../../../components/ui/button';
import { FormField } from '../../../components/ui/form-field';
import { MutationStatus } from '../../../components/ui/mutation-status';
import { Panel } from '../../../components/ui/panel';
import { todayIso } from '../../../lib/calendar-days';
import { scaledToText } from '../../../lib/decimal-input';
import { formatCents } from '../../../lib/money';
import { useRecordPayment } from '../api/mutations';
import { methodWords } from './invoice-summary';
import { paymentFormSchema } from './payment-form-schema';
import type { PaymentFormValues } from './payment-form-schema';

/**
 * Cash, a cheque, a card slip or a transfer taken by hand, or a refund of one. The amount starts
 * at the whole balance, the usual case at the customer's door.
 */
export function RecordPaymentForm({ invoice }: { invoice: InvoiceDetail }) {
  const [today] = useState(todayIso);
  const record = useRecordPayment(invoice.id);
  const [recorded, setRecorded] = useState<string | null>(null);
  const schema = useMemo(
    () => paymentFormSchema({ balanceCents: invoice.balanceCents, paidCents: invoice.paidCents, today }),
    [invoice.balanceCents, invoice.paidCents, today],
  );
  const blank = (balanceCents: number): PaymentFormValues => ({
    method: 'cash',
    amount: balanceCents > 0 ? scaledToText(balanceCents, 2) : '',
    refund: false,
    receivedOn: today,
    reference: '',
  });
  const form = useForm<PaymentFormValues, unknown, ReturnType<typeof schema.parse>>({
    resolver: zodResolver(schema),
    defaultValues: blank(invoice.balanceCents),
  });
  const { errors } = form.formState;
  const refund = useWatch({ control: form.control, name: 'refund' });

  const submit = form.handleSubmit((payment) => {
    setRecorded(null);
    record.mutate(payment, {
      onSuccess: ({ invoice: after, payment: taken }) => {
        const what =
          taken.amountCents < 0
            ? `Refund of ${formatCents(-taken.amountCents)} recorded.`
            : `${formatCents(taken.amountCents)} ${methodWords[taken.method].toLowerCase()} recorded.`;
        setRecorded(`${what} Balance now ${formatCents(after.balanceCents)}.`);
        form.reset(blank(after.balanceCents));
      },
    });
  });

  return (
    <Panel>
      <h2 className="text-xl font-bold">Record a payment</h2>
      <p className="mt-1 text-base text-ink-soft">
        {formatCents(invoice.balanceCents)} left to pay. Card payments made through the payment link are
        recorded by themselves.
      </p>
      <form
        className="mt-4 grid gap-4"
        onSubmit={(event) => void submit(event)}
        noValidate
        aria-label="Record a payment"
      >
        <fieldset className="grid gap-2">
          <legend className="text-base font-bold">How it was paid</legend>
          <div className="flex flex-wrap gap-2">
            {PAYMENT_METHODS.map((method) => (
              <label
                key={method}
                className="flex min-h-touch cursor-pointer items-center gap-2 rounded-plate border-2 border-ink px-4 text-base font-bold has-[:checked]:bg-ink has-[:checked]:text-ground"
              >
                <input type="radio" value={method} className="size-5" {...form.register('method')} />
                {methodWords[method]}
              </label>
            ))}
          </div>
        </fieldset>
        <FormField
          label={refund ? 'Amount refunded ($)' : 'Amount received ($)'}
          hint="Dollars and cents, e.g. 45.50"
          inputMode="decimal"
          autoComplete="off"
          error={errors.amount?.message}
          {...form.register('amount')}
        />
        {invoice.paidCents > 0 ? (
          <label className="flex min-h-touch items-center gap-3 text-base font-bold">
            <input type="checkbox" className="size-6" {...form.register('refund')} />
            This is a refund: money back to the customer
          </label>
        ) : null}
        <FormField
          label="Received on"
          type="date"
          max={today}
          error={errors.receivedOn?.message}
          {...form.register('receivedOn')}
        />
        <FormField
          label="Reference (optional)"
          hint="Cheque number, card slip or transfer reference"
          autoComplete="off"
          maxLength={120}
          error={errors.reference?.message}
          {...form.register('reference')}
        />
        <div className="grid gap-3">
          <Button type="submit" disabled={record.isPending} className="justify-self-start">
            {record.isPending ? 'Recording…' : refund ? 'Record the refund' : 'Record the payment'}
          </Button>
          <MutationStatus
            mutation={record}
            pending="Recording the payment…"
            success={recorded ?? 'Recorded.'}
            failure="The payment was not recorded."
          />
        </div>
      </form>
    </Panel>
  );
}
