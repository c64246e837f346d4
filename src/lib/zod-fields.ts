import { z } from 'zod';

/** Form and API fields that read the same everywhere, with messages that name the field. */
export const requiredText = (field: string, max = 120) =>
  z.string({ required_error: `${field} is required` }).trim().min(1, `${field} is required`).max(max);

/** Optional text: blank and missing both become null. */
export const optionalText = (max = 120) =>
  z
    .string()
    .trim()
    .max(max)
    .optional()
    .nullable()
    .transform((v) => (v ? v : null));

/** An optional e-mail address: blank becomes null, anything else must be an address. */
export const optionalEmail = () =>
  z.string().trim().toLowerCase().email('email must be an e-mail address').max(254).optional().nullable().or(z.literal('')).transform((v) => v || null);
