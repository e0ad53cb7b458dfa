import { z } from 'zod';

/** The one error shape every 4xx/5xx answer carries (CONTRACT.md, "HTTP API"). */
export const ErrorBodySchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ErrorBody = z.infer<typeof ErrorBodySchema>;
