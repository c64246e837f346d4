import { describe, expect, it } from 'vitest';
import {
  MAX_PHOTO_BYTES,
  checkPhotoType,
  isPhotoContentType,
  normaliseDeclaredType,
  photoObjectKey,
  photoSizeProblem,
  photoUrl,
  storeObjectPrefix,
} from '@/features/photos/photos';
import { photoListQuerySchema, photoUploadFieldsSchema } from '@/features/photos/photos.schema';

describe('photo size', () => {
  it('allows 1 byte up to exactly 10 MiB and refuses empty or larger files', () => {
    expect(MAX_PHOTO_BYTES).toBe(10_485_760);
    expect(photoSizeProblem(1)).toBeNull();
    expect(photoSizeProblem(MAX_PHOTO_BYTES)).toBeNull();
    expect(photoSizeProblem(0)).toBe('the file is empty');
    expect(photoSizeProblem(MAX_PHOTO_BYTES + 1)).toBe('the file is 10.0 MB; a photo may be at most 10 MB');
    expect(photoSizeProblem(25 * 1024 * 1024)).toMatch(/25\.0 MB/);
  });
});

describe('photo type', () => {
  it('accepts only JPEG, PNG and WebP content', () => {
    expect(checkPhotoType('image/png')).toEqual({ ok: true, contentType: 'image/png' });
    expect(checkPhotoType('image/webp', 'image/webp')).toEqual({ ok: true, contentType: 'image/webp' });
    expect(checkPhotoType('image/gif')).toEqual({ ok: false, message: "the file's content is image/gif; send a JPEG, PNG or WebP photo" });
    expect(checkPhotoType('application/pdf', 'image/jpeg')).toMatchObject({ ok: false });
    expect(checkPhotoType(undefined, 'image/jpeg')).toEqual({ ok: false, message: 'the file is not an image Cupel can read; send a JPEG, PNG or WebP photo' });
    expect(isPhotoContentType('image/svg+xml')).toBe(false);
    expect(isPhotoContentType('toString')).toBe(false);
  });

  it('refuses a declared type that disagrees with the content', () => {
    expect(checkPhotoType('image/jpeg', 'image/png')).toEqual({ ok: false, message: 'the file was sent as image/png but its content is image/jpeg' });
  });

  it('treats an unknown or vendor-spelled declared type sensibly', () => {
    expect(normaliseDeclaredType('application/octet-stream')).toBeUndefined();
    expect(normaliseDeclaredType('')).toBeUndefined();
    expect(normaliseDeclaredType(undefined)).toBeUndefined();
    expect(normaliseDeclaredType('Image/JPG')).toBe('image/jpeg');
    expect(normaliseDeclaredType('image/png; charset=binary')).toBe('image/png');
    expect(checkPhotoType('image/jpeg', 'image/pjpeg')).toEqual({ ok: true, contentType: 'image/jpeg' });
    expect(checkPhotoType('image/png', 'application/octet-stream')).toEqual({ ok: true, contentType: 'image/png' });
  });
});

describe('photo object keys', () => {
  const storeId = '0b7e3c52-5f1e-4d38-9a57-1f2b7c4d9e10';
  const photoId = 'a6f1d2c3-1111-4222-8333-944455556666';

  it('places a photo under its store and kind with the extension of its type', () => {
    expect(photoObjectKey(storeId, 'id-document', 'image/jpeg', photoId)).toBe(`stores/${storeId}/id-document/${photoId}.jpg`);
    expect(photoObjectKey(storeId, 'item', 'image/webp', photoId)).toBe(`stores/${storeId}/item/${photoId}.webp`);
    expect(photoObjectKey(storeId, 'item', 'image/png', photoId).startsWith(storeObjectPrefix(storeId))).toBe(true);
    expect(photoUrl(photoId)).toBe(`/api/photos/${photoId}`);
  });

  it('refuses ids that could escape the store prefix', () => {
    expect(() => photoObjectKey('../other', 'item', 'image/png', photoId)).toThrow(/cannot be part of an object key/);
    expect(() => photoObjectKey(storeId, 'item', 'image/png', 'x/../../y')).toThrow(/cannot be part of an object key/);
    expect(() => storeObjectPrefix('')).toThrow();
  });
});

describe('photo upload fields', () => {
  it('accepts a kind with a seller or a ticket, treating blank fields as not given', () => {
    expect(photoUploadFieldsSchema.parse({ kind: 'item', ticketId: ' t1 ', sellerId: '' })).toEqual({ kind: 'item', ticketId: 't1' });
  });

  it('names the field that is wrong', () => {
    const noKind = photoUploadFieldsSchema.safeParse({ kind: 'selfie', sellerId: 's1' });
    expect(noKind.success).toBe(false);
    expect(noKind.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([['kind', 'kind must be one of id-document, item']]);
    const orphan = photoUploadFieldsSchema.safeParse({ kind: 'item' });
    expect(orphan.error!.issues.map((i) => i.path.join('.'))).toEqual(['sellerId']);
    const notText = photoUploadFieldsSchema.safeParse({ kind: 'item', sellerId: new Blob(['x']) });
    expect(notText.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([['sellerId', 'sellerId must be text']]);
    expect(photoListQuerySchema.safeParse({}).error!.issues.map((i) => i.path.join('.'))).toEqual(['sellerId']);
  });
});
