import { PHOTO_KINDS } from '@/db/schema';

export { PHOTO_KINDS };
export type PhotoKind = (typeof PHOTO_KINDS)[number];

/** 10 MiB, the same bound as the photos_size_limit check in the database. */
export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;

/** The image types a counter camera or phone produces; each with the extension its objects get. */
export const PHOTO_CONTENT_TYPES = {
  'image/jpeg': 'jpg',
  'image/png': 'png',
  'image/webp': 'webp',
} as const;
export type PhotoContentType = keyof typeof PHOTO_CONTENT_TYPES;

export function isPhotoContentType(value: string | undefined): value is PhotoContentType {
  return value !== undefined && Object.hasOwn(PHOTO_CONTENT_TYPES, value);
}

export function describeSize(byteSize: number): string {
  if (byteSize >= 1024 * 1024) return `${(byteSize / (1024 * 1024)).toFixed(1)} MB`;
  if (byteSize >= 1024) return `${(byteSize / 1024).toFixed(1)} KB`;
  return `${byteSize} bytes`;
}

/** Why a photo of this many bytes is refused, or null when its size is fine. */
export function photoSizeProblem(byteSize: number): string | null {
  if (!Number.isInteger(byteSize) || byteSize <= 0) return 'the file is empty';
  if (byteSize > MAX_PHOTO_BYTES) return `the file is ${describeSize(byteSize)}; a photo may be at most 10 MB`;
  return null;
}

/**
 * The type a browser declared, reduced to a bare lower-case media type. Browsers send
 * application/octet-stream (or nothing) when they do not know, which declares nothing.
 */
export function normaliseDeclaredType(declared: string | null | undefined): string | undefined {
  const bare = (declared ?? '').split(';')[0]!.trim().toLowerCase();
  if (bare === '' || bare === 'application/octet-stream') return undefined;
  if (bare === 'image/jpg' || bare === 'image/pjpeg') return 'image/jpeg';
  return bare;
}

export type PhotoTypeCheck = { ok: true; contentType: PhotoContentType } | { ok: false; message: string };

/** Decides a photo's type from what its bytes are (detected) and what the sender said (declared). */
export function checkPhotoType(detected: string | undefined, declared?: string | null): PhotoTypeCheck {
  if (!isPhotoContentType(detected)) {
    const what = detected ? `the file's content is ${detected}` : 'the file is not an image Cupel can read';
    return { ok: false, message: `${what}; send a JPEG, PNG or WebP photo` };
  }
  const said = normaliseDeclaredType(declared);
  if (said !== undefined && said !== detected) {
    return { ok: false, message: `the file was sent as ${said} but its content is ${detected}` };
  }
  return { ok: true, contentType: detected };
}

const KEY_SEGMENT = /^[A-Za-z0-9-]+$/;

/** Where a photo's bytes live in the bucket: stores/<storeId>/<kind>/<photoId>.<ext>. */
export function photoObjectKey(storeId: string, kind: PhotoKind, contentType: PhotoContentType, photoId: string): string {
  if (!KEY_SEGMENT.test(storeId)) throw new Error(`store id ${JSON.stringify(storeId)} cannot be part of an object key`);
  if (!KEY_SEGMENT.test(photoId)) throw new Error(`photo id ${JSON.stringify(photoId)} cannot be part of an object key`);
  if (!(PHOTO_KINDS as readonly string[]).includes(kind)) throw new Error(`unknown photo kind ${kind}`);
  return `stores/${storeId}/${kind}/${photoId}.${PHOTO_CONTENT_TYPES[contentType]}`;
}

/** The objects of one store share this prefix. */
export function storeObjectPrefix(storeId: string): string {
  if (!KEY_SEGMENT.test(storeId)) throw new Error(`store id ${JSON.stringify(storeId)} cannot be part of an object key`);
  return `stores/${storeId}/`;
}

export function photoUrl(photoId: string): string {
  return `/api/photos/${encodeURIComponent(photoId)}`;
}
