import { z } from 'zod';

/** `overdue` is not a status: it is an open balance past its due date, derived when read. */
export const INVOICE_STATUSES = ['draft', 'issued', 'part_paid', 'paid', 'void'] as const;
export const InvoiceStatusSchema = z.enum(INVOICE_STATUSES);
export type InvoiceStatus = z.infer<typeof InvoiceStatusSchema>;

export const PAYMENT_METHODS = ['card', 'cash', 'cheque', 'transfer'] as const;
export const PaymentMethodSchema = z.enum(PAYMENT_METHODS);

/** SSUTA §324 lets the seller round tax per line or per invoice; the business states which. */
export const TAX_ROUNDING = ['per_line', 'per_invoice'] as const;
export const TaxRoundingSchema = z.enum(TAX_ROUNDING);
export type TaxRounding = z.infer<typeof TaxRoundingSchema>;
