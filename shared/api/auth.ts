import { z } from 'zod';
import { RoleSchema } from './users';

export { ME_PATH, PASSWORD_PATH, SESSION_COOKIE, SIGN_IN_PATH, SIGN_OUT_PATH } from './auth-paths';

export const SignInInputSchema = z.strictObject({
  email: z.string().trim().min(3).max(254),
  password: z.string().min(1).max(200),
});
export type SignInInput = z.infer<typeof SignInInputSchema>;

export const SessionUserSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  role: RoleSchema,
  name: z.string(),
  /** Set for a customer sign-in: the one customer record it may see. */
  customerId: z.number().int().nullable(),
});
export type SessionUser = z.infer<typeof SessionUserSchema>;

export const SignInResponseSchema = z.object({ token: z.string(), user: SessionUserSchema });
export type SignInResponse = z.infer<typeof SignInResponseSchema>;

export const MeResponseSchema = z.object({ user: SessionUserSchema });

/** Sign-out answers 204 with no body. */
export const SignOutResponseSchema = z.undefined();

/**
 * Length is what resists guessing: NIST SP 800-63B asks at least 8 characters and no composition
 * rules; Vanbay asks 10.
 */
export const NewPasswordSchema = z.string().min(10).max(200);

export const ChangePasswordInputSchema = z.strictObject({
  currentPassword: z.string().min(1).max(200),
  newPassword: NewPasswordSchema,
});
