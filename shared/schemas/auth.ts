import { z } from 'zod';

export const emailSchema = z
  .string({ error: 'E-mail is required' })
  .trim()
  .toLowerCase()
  .min(3, 'E-mail is required')
  .max(254, 'E-mail is too long')
  .email('Enter a valid e-mail address');

export const passwordSchema = z
  .string({ error: 'Password is required' })
  .min(10, 'Password must be at least 10 characters')
  .max(200, 'Password must be at most 200 characters');

export const signUpSchema = z.object({
  email: emailSchema,
  password: passwordSchema,
  name: z.string().trim().min(1, 'Name is required').max(100, 'Name is too long'),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const signInSchema = z.object({
  email: emailSchema,
  // Sign-in never tells the user the password rules: any non-empty string is checked.
  password: z.string({ error: 'Password is required' }).min(1, 'Password is required').max(200, 'Password is too long'),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const unitSystemSchema = z.enum(['metric', 'us']);
export type UnitSystem = z.infer<typeof unitSystemSchema>;

export const updateAccountSchema = z.object({
  name: z.string().trim().min(1, 'Name is required').max(100, 'Name is too long').optional(),
});

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'Current password is required'),
  newPassword: passwordSchema,
  endOtherSessions: z.boolean().default(true),
});

/** PATCH /api/account/email: a new e-mail address, confirmed with the current password. */
export const changeEmailSchema = z.object({
  email: emailSchema,
  currentPassword: z.string({ error: 'Current password is required' }).min(1, 'Current password is required').max(200, 'Password is too long'),
});
export type ChangeEmailInput = z.infer<typeof changeEmailSchema>;
