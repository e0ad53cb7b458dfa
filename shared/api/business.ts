import { z } from 'zod';
import { optionalText, text } from './common';
import { TaxRoundingSchema } from './invoices';

export const BUSINESS_PATH = '/api/business';

/**
 * The business's profile and money settings. Amounts are integer cents, markups basis points
 * (2500 = 25 %), the tax rate parts per million (62 500 = 6.25 %), as everywhere in Vanbay.
 * Invoices copy what they need when issued, so a change here rewrites no invoice already out.
 */
export const BusinessSettingsSchema = z.object({
  name: z.string(),
  ownerName: z.string(),
  email: z.string(),
  phone: z.string().nullable(),
  /** The address as printed on the invoice, one line each. */
  addressLines: z.array(z.string()),
  /** The IANA zone the business's calendar days are read in; fixed here (changing it re-dates the books). */
  timezone: z.string(),
  currency: z.string(),
  labourRateCents: z.number().int(),
  partsMarkupBps: z.number().int(),
  /** Trip fee: the base, then `tripFeePerMileCents` for each started mile past `tripFeeFreeMiles`. */
  tripFeeBaseCents: z.number().int(),
  tripFeePerMileCents: z.number().int(),
  tripFeeFreeMiles: z.number().int(),
  shopSuppliesBps: z.number().int(),
  taxRatePpm: z.number().int(),
  taxRounding: TaxRoundingSchema,
  /** Days from issue to due date. */
  invoiceTermsDays: z.number().int(),
  /** A closing line printed on the invoice. */
  invoiceFooter: z.string().nullable(),
  updatedAt: z.string(),
});
export type BusinessSettings = z.infer<typeof BusinessSettingsSchema>;

/**
 * Upper bounds are typo guards far above any one-van business, not policy: $10,000 an hour, a
 * 1000 % markup, a 30 % tax rate (no US combined sales tax comes near it), a year of terms.
 */
export const BUSINESS_LIMITS = {
  labourRateCents: 1_000_000,
  partsMarkupBps: 100_000,
  tripFeeBaseCents: 1_000_000,
  tripFeePerMileCents: 100_000,
  tripFeeFreeMiles: 10_000,
  shopSuppliesBps: 10_000,
  taxRatePpm: 300_000,
  invoiceTermsDays: 365,
} as const;

const whole = (max: number) => z.number().int().min(0).max(max);

/** Any subset of the editable settings; at least one field. Time zone and currency stay as set up. */
export const UpdateBusinessInputSchema = z
  .strictObject({
    name: text(120).optional(),
    ownerName: text(120).optional(),
    email: z.email().max(254).optional(),
    phone: optionalText(40),
    addressLines: z.array(text(120)).max(6).optional(),
    labourRateCents: whole(BUSINESS_LIMITS.labourRateCents).optional(),
    partsMarkupBps: whole(BUSINESS_LIMITS.partsMarkupBps).optional(),
    tripFeeBaseCents: whole(BUSINESS_LIMITS.tripFeeBaseCents).optional(),
    tripFeePerMileCents: whole(BUSINESS_LIMITS.tripFeePerMileCents).optional(),
    tripFeeFreeMiles: whole(BUSINESS_LIMITS.tripFeeFreeMiles).optional(),
    shopSuppliesBps: whole(BUSINESS_LIMITS.shopSuppliesBps).optional(),
    taxRatePpm: whole(BUSINESS_LIMITS.taxRatePpm).optional(),
    taxRounding: TaxRoundingSchema.optional(),
    invoiceTermsDays: whole(BUSINESS_LIMITS.invoiceTermsDays).optional(),
    invoiceFooter: optionalText(500),
  })
  .refine((input) => Object.keys(input).length > 0, { message: 'name at least one setting to change' });
export type UpdateBusinessInput = z.infer<typeof UpdateBusinessInputSchema>;
