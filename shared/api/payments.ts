/**
 * Card payments through a hosted payment service: the link an invoice carries, the webhook the
 * service calls when money moves, and what an invoice send answers once a link is on the PDF.
 * Cash and cheque stay hand-recorded (`CreatePaymentInputSchema` in ./invoices).
 */
import { z } from 'zod';
import { INVOICES_PATH, MAX_PAYMENT_CENTS } from './invoices';
import { OutboxItemSchema } from './outbox';

/** Called by the payment service, never by a person: no sign-in, a signature instead. */
export const PAYMENT_WEBHOOK_PATH = '/api/payments/webhook';
export const INVOICE_PAYMENT_LINK_PATH = `${INVOICES_PATH}/:id/payment-link`;
export const invoicePaymentLinkPath = (id: number) => `${INVOICES_PATH}/${id}/payment-link`;

/** Webhook bodies are small JSON documents; anything larger is not one. */
export const WEBHOOK_MAX_BYTES = 256 * 1024;

/**
 * A link for the whole balance, or for part of it (a deposit) when `amountCents` is given.
 * An open link for the same amount is handed back instead of a second one.
 */
export const CreatePaymentLinkInputSchema = z.strictObject({
  amountCents: z.number().int().positive().max(MAX_PAYMENT_CENTS).optional(),
});
export type CreatePaymentLinkInput = z.infer<typeof CreatePaymentLinkInputSchema>;

export const PaymentLinkSchema = z.object({
  invoiceId: z.number().int(),
  /** The payment service's hosted page; also printed on the invoice PDF. */
  url: z.string(),
  /** The payment service's id for this checkout. */
  sessionId: z.string(),
  amountCents: z.number().int(),
  currency: z.string(),
  /** When the payment service stops taking payment on this link; null when it did not say. */
  expiresAt: z.string().nullable(),
  /** False when an open link for the same amount was handed back. */
  created: z.boolean(),
});
export type PaymentLink = z.infer<typeof PaymentLinkSchema>;

/**
 * An invoice send's answer: the outbox row, and the card link the PDF carries. When payments are
 * set up but the link could not be made, the mail still goes and `paymentLinkError` says why.
 */
export const InvoiceSentSchema = OutboxItemSchema.extend({
  paymentLinkUrl: z.string().nullable(),
  paymentLinkError: z.string().nullable(),
});
export type InvoiceSent = z.infer<typeof InvoiceSentSchema>;

/** What became of one webhook delivery. */
export const WEBHOOK_OUTCOMES = [
  /** A card payment or refund was recorded against its invoice. */
  'recorded',
  /** This event id was handled before: nothing changed. */
  'duplicate',
  /** A refund event that adds nothing to what was already recorded for that payment. */
  'nothing_new',
  /** Money moved for an invoice that takes none (void): kept in the audit log for the owner. */
  'unapplied',
  /** Not an event Vanbay acts on, or not one of its invoices. */
  'ignored',
] as const;
export const WebhookOutcomeSchema = z.enum(WEBHOOK_OUTCOMES);
export type WebhookOutcome = z.infer<typeof WebhookOutcomeSchema>;

export const WebhookReceiptSchema = z.object({
  received: z.literal(true),
  eventId: z.string(),
  outcome: WebhookOutcomeSchema,
  paymentId: z.number().int().nullable(),
});
export type WebhookReceipt = z.infer<typeof WebhookReceiptSchema>;
