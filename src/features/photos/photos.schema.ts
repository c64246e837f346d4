import { z } from 'zod';
import { PHOTO_KINDS } from './photos';

/** A form field naming a record: blank means not given. */
const optionalId = (field: string) =>
  z.preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? undefined : typeof v === 'string' ? v.trim() : v),
    z.string({ invalid_type_error: `${field} must be text` }).max(64, `${field} is too long`).optional(),
  );

/** The text fields sent with a photo upload (the file itself is checked by its bytes). */
export const photoUploadFieldsSchema = z
  .object({
    kind: z.enum(PHOTO_KINDS, {
      errorMap: () => ({ message: `kind must be one of ${PHOTO_KINDS.join(', ')}` }),
    }),
    storeId: optionalId('storeId'),
    sellerId: optionalId('sellerId'),
    ticketId: optionalId('ticketId'),
    lineId: optionalId('lineId'),
  })
  .superRefine((v, ctx) => {
    if (!v.sellerId && !v.ticketId && !v.lineId) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['sellerId'], message: 'a photo belongs to a seller or a ticket: give sellerId or ticketId' });
    }
  });
export type PhotoUploadFields = z.infer<typeof photoUploadFieldsSchema>;

export const photoListQuerySchema = z
  .object({
    storeId: optionalId('storeId'),
    sellerId: optionalId('sellerId'),
    ticketId: optionalId('ticketId'),
  })
  .superRefine((v, ctx) => {
    if (!v.sellerId && !v.ticketId) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['sellerId'], message: 'give sellerId or ticketId' });
    }
  });
export type PhotoListQuery = z.infer<typeof photoListQuerySchema>;
