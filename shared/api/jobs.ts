import { z } from 'zod';

/**
 * A work order's life in the trade's own words (PRODUCT.md, "Jobs"), in the order a job normally
 * moves; `cancelled` can end any open job.
 */
export const JOB_STATUSES = [
  'booked',
  'on_site',
  'diagnosing',
  'awaiting_approval',
  'repairing',
  'complete',
  'invoiced',
  'paid',
  'cancelled',
] as const;
export const JobStatusSchema = z.enum(JOB_STATUSES);
export type JobStatus = z.infer<typeof JobStatusSchema>;

export const LINE_ITEM_KINDS = ['labour', 'part', 'trip', 'supplies', 'other'] as const;
export const LineItemKindSchema = z.enum(LINE_ITEM_KINDS);
export type LineItemKind = z.infer<typeof LineItemKindSchema>;

export const ESTIMATE_STATUSES = ['draft', 'sent', 'approved', 'declined'] as const;
export const EstimateStatusSchema = z.enum(ESTIMATE_STATUSES);
