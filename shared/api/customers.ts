import { z } from 'zod';
import { ListQuerySchema, listResponseSchema, optionalText, text } from './common';

export const CUSTOMERS_PATH = '/api/customers';

export const CustomerSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  addressLines: z.array(z.string()),
  town: z.string().nullable(),
  /** Staff notes; left out (null) for a customer reading their own record. */
  notes: z.string().nullable(),
  archivedAt: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Customer = z.infer<typeof CustomerSchema>;

export const CreateCustomerInputSchema = z.strictObject({
  name: text(120),
  email: z.email().max(254).nullish(),
  phone: optionalText(40),
  addressLines: z.array(text(120)).max(4).optional(),
  town: optionalText(80),
  notes: optionalText(2000),
});
export type CreateCustomerInput = z.infer<typeof CreateCustomerInputSchema>;

export const UpdateCustomerInputSchema = CreateCustomerInputSchema.partial();
export type UpdateCustomerInput = z.infer<typeof UpdateCustomerInputSchema>;

export const CustomerListQuerySchema = ListQuerySchema.extend({
  /** Matches name, e-mail or phone, any part, any case. */
  q: z.string().trim().max(120).optional(),
  archived: z.enum(['true', 'false']).optional(),
});
export type CustomerListQuery = z.infer<typeof CustomerListQuerySchema>;

export const CustomerListSchema = listResponseSchema(CustomerSchema);
