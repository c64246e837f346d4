import { z } from 'zod';
import { ROLES } from '@/db/enums';
import { passwordSchema } from './password';

export const emailSchema = z
  .string({ required_error: 'email is required' })
  .trim()
  .toLowerCase()
  .email('email must be an e-mail address')
  .max(254, 'email is too long');

export const signInSchema = z.object({
  email: z.string().trim().min(1, 'email is required').max(254),
  password: z.string().min(1, 'password is required').max(200),
});

export const createStaffUserSchema = z
  .object({
    name: z.string({ required_error: 'name is required' }).trim().min(1, 'name is required').max(120),
    email: emailSchema,
    role: z.enum(['admin', 'manager', 'clerk'], { errorMap: () => ({ message: 'role must be admin, manager or clerk' }) }),
    storeId: z.string().trim().min(1).nullable().optional(),
    password: passwordSchema,
  })
  .refine((u) => u.role === 'admin' || !!u.storeId, { path: ['storeId'], message: 'storeId is required for managers and clerks' });
export type CreateStaffUserInput = z.infer<typeof createStaffUserSchema>;

export const resetPasswordSchema = z.object({ password: passwordSchema });

export const updateUserSchema = z
  .object({
    role: z.enum(ROLES).optional(),
    active: z.boolean().optional(),
    storeId: z.string().trim().min(1).nullable().optional(),
  })
  .refine((u) => Object.keys(u).length > 0, { message: 'nothing to change' });
