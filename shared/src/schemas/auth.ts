import { z } from 'zod';
import { emailSchema, safeString } from './common.js';

/**
 * OWASP Password Storage Cheat Sheet: bcrypt truncates input at 72 bytes, so longer passwords
 * are refused rather than silently cut. Minimum length 10 (OWASP Authentication Cheat Sheet
 * recommends at least 8).
 */
export const PASSWORD_MIN = 10;
export const PASSWORD_MAX_BYTES = 72;
export const passwordSchema = safeString('Password')
  .min(PASSWORD_MIN, { message: `Use at least ${PASSWORD_MIN} characters.` })
  .refine((p) => new TextEncoder().encode(p).length <= PASSWORD_MAX_BYTES, {
    message: `Use at most ${PASSWORD_MAX_BYTES} bytes (about ${PASSWORD_MAX_BYTES} plain letters).`,
  });

export const signInSchema = z.object({
  email: emailSchema,
  password: safeString('Password').min(1, { message: 'Enter your password.' }).max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const passwordResetRequestSchema = z.object({ email: emailSchema });
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

export const tokenSchema = z.string().trim().min(20).max(200).regex(/^[A-Za-z0-9_-]+$/, { message: 'This link is not valid.' });

export const passwordResetCompleteSchema = z
  .object({
    token: tokenSchema,
    password: passwordSchema,
    confirmPassword: safeString('Repeated password'),
  })
  .refine((v) => v.password === v.confirmPassword, { path: ['confirmPassword'], message: 'The passwords do not match.' });
export type PasswordResetCompleteInput = z.infer<typeof passwordResetCompleteSchema>;

export const invitationAcceptSchema = z
  .object({
    token: tokenSchema,
    name: safeString('Your name').trim().min(1, { message: 'Your name is required.' }).max(120),
    password: passwordSchema,
    confirmPassword: safeString('Repeated password'),
  })
  .refine((v) => v.password === v.confirmPassword, { path: ['confirmPassword'], message: 'The passwords do not match.' });
export type InvitationAcceptInput = z.infer<typeof invitationAcceptSchema>;

export const tokenParamsSchema = z.object({ token: tokenSchema });
