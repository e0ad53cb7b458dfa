import { z } from 'zod';
import { IdSchema, ListQuerySchema, listResponseSchema, optionalText, text } from './common';
import { LineItemKindSchema } from './jobs';

/** A job's work and parts: `/api/jobs/:id/line-items`. */
export const JOB_LINE_ITEMS_PATH = '/api/jobs/:id/line-items';
export const jobLineItemsPath = (jobId: number) => `/api/jobs/${jobId}/line-items`;

export const LineItemParamsSchema = z.object({ id: IdSchema, itemId: IdSchema });

/** Up to a million units (or hours) in thousandths still fits the 32-bit `quantity_milli` column. */
const MAX_QUANTITY_MILLI = 1_000_000_000;
const DECIMAL = /^(\d{1,7})(?:\.(\d{1,3}))?$/;

/**
 * A quantity in thousandths, read digit by digit from its decimal text so 1.005 h is exactly
 * 1005 and never 1004.999…; null for more than three decimals, zero, a negative or a size past
 * the column. A JSON number is read from its shortest decimal form (`String(n)`).
 */
export function quantityToMilli(quantity: number | string): number | null {
  const written = typeof quantity === 'number' ? String(quantity) : quantity.trim();
  const match = DECIMAL.exec(written);
  if (!match) return null;
  const milli = Number(match[1]) * 1000 + Number((match[2] ?? '').padEnd(3, '0'));
  return milli > 0 && milli <= MAX_QUANTITY_MILLI ? milli : null;
}

export const LineQuantitySchema = z
  .union([z.number().finite(), z.string().trim().min(1).max(20)])
  .refine((q) => quantityToMilli(q) !== null, {
    message: 'a quantity above 0 with at most 3 decimals, e.g. 1.5 or 0.125',
  });

const LineItemFieldsSchema = z.strictObject({
  kind: LineItemKindSchema,
  description: text(200),
  partNumber: optionalText(60),
  quantity: LineQuantitySchema,
  /** Omitted on a labour line: the business's labour rate. Required on every other kind. */
  unitPriceCents: z.number().int().min(0).max(10_000_000).optional(),
  /** Basis points on top of the unit price (2500 = 25 %); parts default to the business's markup. */
  markupBps: z.number().int().min(0).max(100_000).optional(),
  /** Defaults: labour and trip not taxable; parts, supplies and other taxable. */
  taxable: z.boolean().optional(),
  /** Order on the estimate and invoice; defaults to after the job's last line. */
  position: z.number().int().min(0).max(10_000).optional(),
});

export const CreateLineItemInputSchema = LineItemFieldsSchema.refine(
  (line) => line.kind === 'labour' || line.unitPriceCents !== undefined,
  { message: 'unitPriceCents is required except on a labour line', path: ['unitPriceCents'] },
);
export type CreateLineItemInput = z.infer<typeof CreateLineItemInputSchema>;

export const UpdateLineItemInputSchema = LineItemFieldsSchema.partial();
export type UpdateLineItemInput = z.infer<typeof UpdateLineItemInputSchema>;

export const LineItemSchema = z.object({
  id: z.number().int(),
  jobId: z.number().int(),
  kind: LineItemKindSchema,
  description: z.string(),
  partNumber: z.string().nullable(),
  /** Decimal units or hours: `quantityMilli / 1000`. */
  quantity: z.number(),
  quantityMilli: z.number().int(),
  unitPriceCents: z.number().int(),
  markupBps: z.number().int(),
  taxable: z.boolean(),
  position: z.number().int(),
  /** Set when the line came from a check's suggested lines. */
  checkRunId: z.number().int().nullable(),
  /** quantity × unit price × (1 + markup), rounded half up to the cent (shared/money.ts). */
  lineTotalCents: z.number().int(),
  /** A part or supplies line still at price 0: Vanbay never guesses a part's price. */
  needsPrice: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type LineItem = z.infer<typeof LineItemSchema>;

export const LineItemListQuerySchema = ListQuerySchema;
export type LineItemListQuery = z.infer<typeof LineItemListQuerySchema>;

/** Ordered by position (then id), as the estimate and the invoice list them. */
export const LineItemListSchema = listResponseSchema(LineItemSchema);

/** The answer to `POST /api/jobs/:id/checks/:runId/apply-lines`. */
export const AppliedLinesSchema = z.object({
  checkRunId: z.number().int(),
  items: z.array(LineItemSchema),
  /** Said when any part or supplies line was added at price 0. */
  note: z.string().nullable(),
});
export type AppliedLines = z.infer<typeof AppliedLinesSchema>;
