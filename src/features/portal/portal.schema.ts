import { z } from 'zod';
import { passwordSchema } from '@/features/auth/password';
import { optionalEmail, optionalText as optional } from '@/lib/zod-fields';


/** What a seller may correct themself: contact and address. Name, date of birth and ID are checked at the counter. */
export const contactUpdateSchema = z
  .object({
    email: optionalEmail(),
    phone: optional(40),
    addressLine1: z.string().trim().min(1, 'addressLine1 is required').max(160),
    addressLine2: optional(160),
    city: z.string().trim().min(1, 'city is required').max(80),
    region: z.string().trim().min(1, 'region is required').max(80),
    postalCode: z.string().trim().min(1, 'postalCode is required').max(20),
  })
  .refine((v) => !!v.email || !!v.phone, { path: ['phone'], message: 'give an e-mail address or a phone number' });
export type ContactUpdate = z.infer<typeof contactUpdateSchema>;

export const portalPasswordSchema = z.object({ password: passwordSchema });
