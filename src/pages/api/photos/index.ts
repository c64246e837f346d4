import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { photoListQuerySchema, photoUploadFieldsSchema } from '@/features/photos/photos.schema';
import { listPhotos, readPhotoForm, storePhoto } from '@/features/photos/photos.server';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { validationError } from '@/lib/errors';
import { handle, json } from '@/lib/http';

export const POST: APIRoute = handle(async ({ locals, request }) => {
  const user = requireRole(locals, 'staff');
  const form = await readPhotoForm(request);
  const parsed = photoUploadFieldsSchema.safeParse(form.fields);
  if (!parsed.success) throw validationError(parsed.error);
  const { storeId: requestedStoreId, ...fields } = parsed.data;
  const storeId = storeScope(user, requestedStoreId);
  const photo = await storePhoto(getDb(), user, {
    ...fields,
    storeId,
    bytes: form.file.bytes,
    declaredType: form.file.declaredType,
  });
  return json({ photo }, 201);
});

export const GET: APIRoute = handle(async ({ locals, request }) => {
  const user = requireRole(locals, 'staff');
  const parsed = photoListQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw validationError(parsed.error);
  const { storeId: requestedStoreId, ...filter } = parsed.data;
  const storeId = storeScope(user, requestedStoreId);
  return json({ photos: await listPhotos(getDb(), storeId, filter) });
});
