import { z } from 'zod';
import { CreatePaymentInputSchema, PaymentMethodSchema } from '../../../../shared/api/invoices';
import type { CreatePaymentInput } from '../../../../shared/api/invoices';
import { calendarDate } from '../../../lib/format';
import { parseScaled } from '../../../lib/decimal-input';
import { formatCents } from '../../../lib/money';

/** What the form holds: text as typed, turned into the API's payment by `paymentFormSchema`. */
export type PaymentFormValues = {
  method: z.infer<typeof PaymentMethodSchema>;
  amount: string;
  refund: boolean;
  /** YYYY-MM-DD; today means "now" (the server's clock), any other day noon of that day. */
  receivedOn: string;
  reference: string;
};

type Limits = { balanceCents: number; paidCents: number; today: string };

/**
 * The typed amount becomes integer cents by string arithmetic, and the result is checked with the
 * shared CreatePaymentInputSchema, so the form refuses exactly what the server would, plus what
 * the invoice itself rules out: more than its balance, or a refund of more than was paid.
 */
export function paymentFormSchema({ balanceCents, paidCents, today }: Limits) {
  return z
    .object({
      method: PaymentMethodSchema,
      amount: z.string(),
      refund: z.boolean(),
      receivedOn: z.iso.date({ error: 'Pick the day the money arrived' }),
      reference: z.string().trim().max(120, 'At most 120 characters'),
    })
    .transform((values, ctx): CreatePaymentInput => {
      const amount = parseScaled(values.amount, 2);
      if (!amount.ok) {
        ctx.addIssue({
          code: 'custom',
          path: ['amount'],
          message: `The amount ${amount.reason}: type it like 45.50`,
        });
        return z.NEVER;
      }
      if (amount.value === 0) {
        ctx.addIssue({ code: 'custom', path: ['amount'], message: 'An amount of 0 records nothing' });
        return z.NEVER;
      }
      if (!values.refund && amount.value > balanceCents) {
        ctx.addIssue({
          code: 'custom',
          path: ['amount'],
          message: `That is more than the ${formatCents(balanceCents)} left to pay`,
        });
        return z.NEVER;
      }
      if (values.refund && amount.value > paidCents) {
        ctx.addIssue({
          code: 'custom',
          path: ['amount'],
          message: `A refund can be at most the ${formatCents(paidCents)} paid so far`,
        });
        return z.NEVER;
      }
      if (values.receivedOn > today) {
        ctx.addIssue({ code: 'custom', path: ['receivedOn'], message: 'That day has not come yet' });
        return z.NEVER;
      }
      const payment = CreatePaymentInputSchema.safeParse({
        method: values.method,
        amountCents: values.refund ? -amount.value : amount.value,
        ...(values.receivedOn === today ? {} : { receivedAt: noonOf(values.receivedOn) }),
        reference: values.reference === '' ? null : values.reference,
      });
      if (!payment.success) {
        for (const issue of payment.error.issues) {
          ctx.addIssue({ code: 'custom', path: ['amount'], message: issue.message });
        }
        return z.NEVER;
      }
      return payment.data;
    });
}

/** Midday of a past day on this device: far from midnight, so no time zone moves it to another day. */
function noonOf(day: string): string {
  const date = calendarDate(day);
  date.setHours(12, 0, 0, 0);
  return date.toISOString();
}
