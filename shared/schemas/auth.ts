import { z } from 'zod';
import { emailSchema, newPasswordSchema, PASSWORD_MAX } from './fields';

export const signInSchema = z.strictObject({
  email: emailSchema,
  // Not checked against the length rule: a wrong password gets the same answer as any other.
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(PASSWORD_MAX, 'Password is too long.'),
});
export type SignIn = z.infer<typeof signInSchema>;

export const passwordResetRequestSchema = z.strictObject({ email: emailSchema });
export type PasswordResetRequest = z.infer<typeof passwordResetRequestSchema>;

export const passwordResetConfirmSchema = z.strictObject({
  token: z.string({ error: 'The link is incomplete.' }).regex(/^[A-Za-z0-9_-]{43}$/, 'The link is incomplete or damaged.'),
  password: newPasswordSchema,
});
export type PasswordResetConfirm = z.infer<typeof passwordResetConfirmSchema>;
