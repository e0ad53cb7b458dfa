import { z } from 'zod';

/** Who does what (PRODUCT.md, "Who uses it"): the owner is the mechanic and may do everything. */
export const ROLES = ['owner', 'helper', 'bookkeeper', 'customer'] as const;
export const RoleSchema = z.enum(ROLES);
export type Role = z.infer<typeof RoleSchema>;

export const USERS_PATH = '/api/users';

export const UserSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: RoleSchema,
  customerId: z.number().int().nullable(),
  disabled: z.boolean(),
  lastSignInAt: z.string().nullable(),
  createdAt: z.string(),
});
export type User = z.infer<typeof UserSchema>;

export const CreateUserInputSchema = z
  .strictObject({
    email: z.email().max(254),
    name: z.string().trim().min(1).max(120),
    role: RoleSchema,
    /** Set by the owner and handed over; the new user changes it after signing in. */
    password: z.string().min(10).max(200),
    customerId: z.number().int().positive().nullish(),
  })
  .refine((u) => (u.role === 'customer') === (u.customerId != null), {
    message: 'a customer sign-in needs a customerId, and only a customer sign-in may have one',
    path: ['customerId'],
  });
export type CreateUserInput = z.infer<typeof CreateUserInputSchema>;

export const UpdateUserInputSchema = z.strictObject({
  name: z.string().trim().min(1).max(120).optional(),
  role: z.enum(['owner', 'helper', 'bookkeeper']).optional(),
  disabled: z.boolean().optional(),
});
export type UpdateUserInput = z.infer<typeof UpdateUserInputSchema>;
