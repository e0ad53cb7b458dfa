import { z } from 'zod';
import {
  IdSchema,
  IsoDateSchema,
  IsoDateTimeSchema,
  ListQuerySchema,
  listResponseSchema,
  optionalText,
} from './common';
import { LineItemKindSchema } from './jobs';

/** `overdue` is not a status: it is an open balance past its due date, derived when read. */
export const INVOICE_STATUSES = ['draft', 'issued', 'part_paid', 'paid', 'void'] as const;
export const InvoiceStatusSchema = z.enum(INVOICE_STATUSES);
export type InvoiceStatus = z.infer<typeof InvoiceStatusSchema>;

export const PAYMENT_METHODS = ['card', 'cash', 'cheque', 'transfer'] as const;
export const PaymentMethodSchema = z.enum(PAYMENT_METHODS);
export type PaymentMethod = z.infer<typeof PaymentMethodSchema>;

/** SSUTA §324 lets the seller round tax per line or per invoice; the business states which. */
export const TAX_ROUNDING = ['per_line', 'per_invoice'] as const;
export const TaxRoundingSchema = z.enum(TAX_ROUNDING);
export type TaxRounding = z.infer<typeof TaxRoundingSchema>;

export const INVOICES_PATH = '/api/invoices';
export const INVOICE_PAYMENTS_PATH = `${INVOICES_PATH}/:id/payments`;
export const invoicePath = (id: number) => `${INVOICES_PATH}/${id}`;
export const invoicePaymentsPath = (id: number) => `${INVOICES_PATH}/${id}/payments`;

/** A line as it was billed: copied from the job's line items when the invoice was issued. */
export const InvoiceLineSchema = z.object({
  id: z.number().int(),
  position: z.number().int(),
  kind: LineItemKindSchema,
  description: z.string(),
  /** Thousandths of a unit: 1.5 labour hours = 1500. */
  quantityMilli: z.number().int(),
  /** The job line's unit price before any parts markup; `lineTotalCents` includes the markup. */
  unitPriceCents: z.number().int(),
  lineTotalCents: z.number().int(),
  /** The line's own tax when the invoice rounds per line; 0 when it rounds once per invoice. */
  taxCents: z.number().int(),
});
export type InvoiceLine = z.infer<typeof InvoiceLineSchema>;

/** Money in; a negative amount is a refund. */
export const PaymentSchema = z.object({
  id: z.number().int(),
  invoiceId: z.number().int(),
  method: PaymentMethodSchema,
  amountCents: z.number().int(),
  receivedAt: z.string(),
  reference: z.string().nullable(),
  recordedBy: z.number().int().nullable(),
  createdAt: z.string(),
});
export type Payment = z.infer<typeof PaymentSchema>;

export const InvoiceSchema = z.object({
  id: z.number().int(),
  number: z.number().int(),
  customerId: z.number().int(),
  customerName: z.string(),
  jobId: z.number().int(),
  status: InvoiceStatusSchema,
  /** YYYY-MM-DD on the business's calendar. */
  issuedOn: z.string(),
  dueOn: z.string(),
  subtotalCents: z.number().int(),
  taxCents: z.number().int(),
  totalCents: z.number().int(),
  paidCents: z.number().int(),
  /** Always totalCents − paidCents (a check constraint in the database keeps it so). */
  balanceCents: z.number().int(),
  /** The rate and rounding the tax was figured with, kept so a later settings change rewrites nothing. */
  taxRatePpm: z.number().int(),
  taxRounding: TaxRoundingSchema,
  terms: z.string().nullable(),
  overdue: z
    .boolean()
    .describe(
      'A balance above 0 past its due date (dueOn before today, business calendar); never for a void invoice',
    ),
  daysOverdue: z.number().int().describe('Days since the due date while overdue; 0 otherwise'),
  /** The card payment link the PDF and the e-mail carry (shared/api/payments.ts); null when none was made. */
  paymentLinkUrl: z.string().nullable(),
  sentAt: z.string().nullable(),
  voidedAt: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Invoice = z.infer<typeof InvoiceSchema>;

export const InvoiceDetailSchema = InvoiceSchema.extend({
  lines: z.array(InvoiceLineSchema),
  /** Oldest first, as they reduced the balance. */
  payments: z.array(PaymentSchema),
});
export type InvoiceDetail = z.infer<typeof InvoiceDetailSchema>;

/** Issues the invoice for a complete job from its line items, at the business's tax settings. */
export const CreateInvoiceInputSchema = z.strictObject({
  jobId: z.number().int().positive().max(2_147_483_647),
});
export type CreateInvoiceInput = z.infer<typeof CreateInvoiceInputSchema>;

/** The only change an issued invoice takes here: voiding it (owner, and only while nothing is paid). */
export const UpdateInvoiceInputSchema = z.strictObject({ status: z.literal('void') });
export type UpdateInvoiceInput = z.infer<typeof UpdateInvoiceInputSchema>;

/** The statuses a list can filter by: the stored ones, and `overdue` (derived, see InvoiceSchema). */
export const INVOICE_LIST_STATUSES = [...INVOICE_STATUSES, 'overdue'] as const;

export const InvoiceListQuerySchema = ListQuerySchema.extend({
  status: z.enum(INVOICE_LIST_STATUSES).optional(),
  customerId: IdSchema.optional(),
  jobId: IdSchema.optional(),
  /** `true`: an open balance (above 0, not void); `false`: nothing left to pay. */
  unpaid: z.enum(['true', 'false']).optional(),
  /** Issued on or after this day. */
  from: IsoDateSchema.optional(),
  /** Issued on or before this day. */
  to: IsoDateSchema.optional(),
});
export type InvoiceListQuery = z.infer<typeof InvoiceListQuerySchema>;

export const InvoiceListSchema = listResponseSchema(InvoiceSchema);

/** Largest single payment or refund taken: $1,000,000 (a typo guard far above any van job). */
export const MAX_PAYMENT_CENTS = 100_000_000;

export const CreatePaymentInputSchema = z.strictObject({
  method: PaymentMethodSchema,
  /** Integer cents; negative is a refund. Never 0. */
  amountCents: z
    .number()
    .int()
    .min(-MAX_PAYMENT_CENTS)
    .max(MAX_PAYMENT_CENTS)
    .refine((cents) => cents !== 0, 'a payment of 0 records nothing'),
  /** When the money arrived; the server's clock when left out. */
  receivedAt: IsoDateTimeSchema.optional(),
  /** Cheque number, card slip, transfer reference. */
  reference: optionalText(120),
});
export type CreatePaymentInput = z.infer<typeof CreatePaymentInputSchema>;

export const PaymentListQuerySchema = ListQuerySchema;
export type PaymentListQuery = z.infer<typeof PaymentListQuerySchema>;
export const PaymentListSchema = listResponseSchema(PaymentSchema);

/** A recorded payment and the invoice as it stands after it. */
export const RecordedPaymentSchema = z.object({ payment: PaymentSchema, invoice: InvoiceSchema });
export type RecordedPayment = z.infer<typeof RecordedPaymentSchema>;
