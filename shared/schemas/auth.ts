import { z } from 'zod';

export const ROLES = ['operator', 'supervisor', 'metallurgist', 'engineer', 'admin'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** ASVS 5.0 6.2.1/6.2.9: at least 8 characters, long passphrases accepted. */
export const passwordSchema = z
  .string()
  .min(8, 'Password must be at least 8 characters')
  .max(128, 'Password must be at most 128 characters');

export const emailSchema = z.string().trim().toLowerCase().email('Enter a valid e-mail address').max(254);

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password').max(128),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password').max(128),
  newPassword: passwordSchema,
});
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

export const createUserSchema = z.object({
  email: emailSchema,
  name: z.string().trim().min(1, 'Enter a name').max(120),
  role: roleSchema,
  password: passwordSchema,
});
export type CreateUserInput = z.infer<typeof createUserSchema>;

/** A role change or disabling someone signs them out at once: it needs a reason, kept in the audit trail. */
export const updateUserSchema = z
  .object({
    role: roleSchema.optional(),
    disabled: z.boolean().optional(),
    name: z.string().trim().min(1).max(120).optional(),
    reason: z.string().trim().min(3, 'Give a reason (at least 3 characters)').max(500, 'At most 500 characters').optional(),
  })
  .refine((v) => Object.keys(v).some((k) => k !== 'reason'), 'Nothing to change')
  .refine((v) => (v.role === undefined && v.disabled === undefined) || v.reason !== undefined, {
    message: 'Give a reason for changing a role or access', path: ['reason'],
  });
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

export type SessionUser = { id: number; email: string; name: string; role: Role };
export type UserRow = SessionUser & { disabled: boolean; createdAt: string };
