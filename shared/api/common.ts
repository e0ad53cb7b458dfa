import { z } from 'zod';

/** Route ids are positive integers (identity columns); anything else is a 400, not a lookup. */
export const IdSchema = z.coerce.number().int().positive().max(2_147_483_647);
export const IdParamsSchema = z.object({ id: IdSchema });

/** Plain calendar dates travel as YYYY-MM-DD; instants as ISO 8601 with an offset. */
export const IsoDateSchema = z.iso.date();
export const IsoDateTimeSchema = z.iso.datetime({ offset: true });

/** Bounded free text: trimmed, never empty when given. */
export const text = (max: number) => z.string().trim().min(1).max(max);
export const optionalText = (max: number) => z.string().trim().max(max).nullish();

/** CONTRACT.md: list routes accept `limit` (1–100) and `cursor`. */
export const ListQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(100).default(25),
  cursor: z.string().max(200).optional(),
});
export type ListQuery = z.infer<typeof ListQuerySchema>;

/** CONTRACT.md: `{"items": [...], "nextCursor": string|null}`. */
export function listResponseSchema<T extends z.ZodType>(item: T) {
  return z.object({ items: z.array(item), nextCursor: z.string().nullable() });
}
export interface ListResponse<T> {
  items: T[];
  nextCursor: string | null;
}
