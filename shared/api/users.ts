import { z } from 'zod';

/** Who does what (PRODUCT.md, "Who uses it"): the owner is the mechanic and may do everything. */
export const ROLES = ['owner', 'helper', 'bookkeeper', 'customer'] as const;
export const RoleSchema = z.enum(ROLES);
export type Role = z.infer<typeof RoleSchema>;
