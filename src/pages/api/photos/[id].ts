import type { APIRoute } from 'astro';
import { getDb } from '@/db/client';
import { PHOTO_CONTENT_TYPES } from '@/features/photos/photos';
import { getPhoto } from '@/features/photos/photos.server';
import { requireRole } from '@/lib/auth-guard';
import { handle } from '@/lib/http';

export const GET: APIRoute = handle(async ({ locals, params }) => {
  const user = requireRole(locals, 'staff');
  const { photo, contentType, byteSize, body } = await getPhoto(getDb(), user, params.id ?? '');
  return new Response(body, {
    status: 200,
    headers: {
      'content-type': contentType,
      'content-length': String(byteSize),
      'content-disposition': `inline; filename="${photo.id}.${PHOTO_CONTENT_TYPES[contentType]}"`,
      // ID documents are personal data: never kept by a browser or a shared cache.
      'cache-control': 'private, no-store',
      'x-content-type-options': 'nosniff',
    },
  });
});
