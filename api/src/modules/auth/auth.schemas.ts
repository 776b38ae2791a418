// Request bodies of the auth routes. Strict objects: unknown keys (e.g. `roles`) are refused,
// so nothing can be mass-assigned. Length limits on passwords are generous here; the policy in
// passwords.ts decides (and counts code points, not UTF-16 units).
import { z } from 'zod';
import { SINGLE_LINE, SINGLE_LINE_MESSAGE } from '../../schemas';

export const email = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, 'Use at most 254 characters.')
  .pipe(z.email({ error: 'Enter an e-mail address like name@example.org.' }));

/** Any password-shaped string; the policy check comes later, with the person's context. */
export const passwordInput = z.string().min(1, 'Enter a password.').max(1024, 'Use at most 128 characters.');

export const displayName = z
  .string()
  .trim()
  .min(1, 'Enter a name.')
  .max(100, 'Use at most 100 characters.')
  .regex(SINGLE_LINE, SINGLE_LINE_MESSAGE);

export const callSign = z
  .string()
  .trim()
  .toUpperCase()
  .max(12, 'Use at most 12 characters.')
  .regex(/^[A-Z0-9/]*$/, 'Use letters, digits and / only.')
  .transform((v) => (v === '' ? null : v));

export const signInBody = z.strictObject({
  email: z.string().trim().toLowerCase().min(1, 'Enter your e-mail address.').max(254),
  password: z.string().min(1, 'Enter your password.').max(1024),
});

export const registerBody = z.strictObject({
  email,
  password: passwordInput,
  displayName,
  callSign: callSign.nullable().optional(),
});

export const changePasswordBody = z.strictObject({
  currentPassword: z.string().min(1, 'Enter your current password.').max(1024),
  newPassword: passwordInput,
});

export const resetRequestBody = z.strictObject({ email: z.string().trim().toLowerCase().min(1, 'Enter your e-mail address.').max(254) });

export const resetConfirmBody = z.strictObject({
  token: z.string().min(1).max(200),
  newPassword: passwordInput,
});

export type SignInBody = z.infer<typeof signInBody>;
export type RegisterBody = z.infer<typeof registerBody>;
export type ChangePasswordBody = z.infer<typeof changePasswordBody>;
export type ResetRequestBody = z.infer<typeof resetRequestBody>;
export type ResetConfirmBody = z.infer<typeof resetConfirmBody>;
