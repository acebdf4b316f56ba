import { z } from 'zod';

/** Payloads of /api/auth/*, /api/account/* and the signed-in user. */

export const PASSWORD_MIN_LENGTH = 10;
export const PASSWORD_MAX_LENGTH = 200;

export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, 'an e-mail address is at most 254 characters')
  .pipe(z.email('enter a valid e-mail address'));

export const displayNameSchema = z
  .string()
  .trim()
  .min(1, 'enter a display name')
  .max(100, 'a display name is at most 100 characters');

export const passwordSchema = z
  .string()
  .min(PASSWORD_MIN_LENGTH, `a password has at least ${PASSWORD_MIN_LENGTH} characters`)
  .max(PASSWORD_MAX_LENGTH, `a password has at most ${PASSWORD_MAX_LENGTH} characters`);

export const siteRoleSchema = z.enum(['member', 'admin']);
export type SiteRole = z.infer<typeof siteRoleSchema>;

export const signUpRequestSchema = z.object({
  email: emailSchema,
  name: displayNameSchema,
  password: passwordSchema,
});
export type SignUpRequest = z.infer<typeof signUpRequestSchema>;

/** Sign-in does not enforce the password rules: a wrong password gets the same 401 either way. */
export const signInRequestSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'enter your password').max(PASSWORD_MAX_LENGTH),
});
export type SignInRequest = z.infer<typeof signInRequestSchema>;

/** POST /api/auth/sign-up/confirm: the token from the mailed link. */
export const signUpConfirmSchema = z.object({ token: z.string().min(1).max(200) });
export type SignUpConfirm = z.infer<typeof signUpConfirmSchema>;

/** The one answer to every sign-up, whether or not the address already has an account. */
export const signUpAcceptedSchema = z.object({ message: z.string() });
export type SignUpAccepted = z.infer<typeof signUpAcceptedSchema>;

export const passwordResetRequestSchema = z.object({ email: emailSchema });
export type PasswordResetRequest = z.infer<typeof passwordResetRequestSchema>;

export const passwordResetConfirmSchema = z.object({
  token: z.string().min(1, 'the reset link has no token').max(200),
  password: passwordSchema,
});
export type PasswordResetConfirm = z.infer<typeof passwordResetConfirmSchema>;

export const updateAccountRequestSchema = z.object({ name: displayNameSchema.optional() });
export type UpdateAccountRequest = z.infer<typeof updateAccountRequestSchema>;

export const changePasswordRequestSchema = z.object({
  currentPassword: z.string().min(1, 'enter your current password').max(PASSWORD_MAX_LENGTH),
  newPassword: passwordSchema,
});
export type ChangePasswordRequest = z.infer<typeof changePasswordRequestSchema>;

/** What GET /api/auth/me, sign-up and sign-in answer. */
export const currentUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: siteRoleSchema,
});
export type CurrentUser = z.infer<typeof currentUserSchema>;
