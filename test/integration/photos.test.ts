import { afterAll, describe, expect, it } from 'vitest';
import type { APIContext } from 'astro';
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, ListObjectsV2Command } from '@aws-sdk/client-s3';
import { and, eq, sql } from 'drizzle-orm';
import { createHash } from 'node:crypto';
import { auditLog, photos, ticketLines, tickets } from '@/db/schema';
import { loadActiveUser, type SessionUser } from '@/features/auth/users.server';
import { MAX_PHOTO_BYTES, storeObjectPrefix } from '@/features/photos/photos';
import { createPhotoStorage, getPhoto, listPhotos, readPhotoForm, storePhoto } from '@/features/photos/photos.server';
import { GET as getPhotoRoute } from '@/pages/api/photos/[id]';
import { GET as listPhotosRoute, POST as postPhotoRoute } from '@/pages/api/photos/index';
import { makeSeller, makeStore, makeUser, ownerTestDb, testDb, unique } from '../support/db';

if (!process.env.S3_ENDPOINT) {
  throw new Error('S3_ENDPOINT is not set: run the photo tests through ./docker-free-start.sh test integration, which starts the S3 fake');
}

const db = testDb();
// The owner role, for the one test that adds a trigger of its own.
const owner = ownerTestDb();
const storage = createPhotoStorage();
afterAll(() => storage.client.destroy());

// 1x1 images, each decodable by an image library (checked when they were made).
const PNG = base64('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==');
const JPEG = base64(
  '/9j/2wBDABALDA4MChAODQ4SERATGCgaGBYWGDEjJR0oOjM9PDkzODdASFxOQERXRTc4UG1RV19iZ2hnPk1xeXBkeFxlZ2P/2wBDARESEhgVGC8aGi9jQjhCY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2NjY2P/wAARCAABAAEDASIAAhEBAxEB/8QAFQABAQAAAAAAAAAAAAAAAAAAAAX/xAAUEAEAAAAAAAAAAAAAAAAAAAAA/8QAFQEBAQAAAAAAAAAAAAAAAAAABAX/xAAUEQEAAAAAAAAAAAAAAAAAAAAA/9oADAMBAAIRAxEAPwCiAjmv/9k=',
);
const WEBP = base64('UklGRhoAAABXRUJQVlA4TA0AAAAvAAAAEAcQERGIiP4HAA==');
const NOT_AN_IMAGE = new TextEncoder().encode('Name: Pat Example\nID: D1234567\nThis is a text file with a .jpg name.\n');

function base64(text: string): Uint8Array<ArrayBuffer> {
  return new Uint8Array(Buffer.from(text, 'base64'));
}

function sha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

async function bytesOf(stream: ReadableStream<Uint8Array>): Promise<Uint8Array> {
  return new Uint8Array(await new Response(stream).arrayBuffer());
}

async function objectBytes(key: string): Promise<Uint8Array> {
  const object = await storage.client.send(new GetObjectCommand({ Bucket: storage.bucket, Key: key }));
  return object.Body!.transformToByteArray();
}

async function keysUnder(prefix: string): Promise<string[]> {
  const listing = await storage.client.send(new ListObjectsV2Command({ Bucket: storage.bucket, Prefix: prefix }));
  return (listing.Contents ?? []).map((o) => o.Key!);
}

async function sessionUser(id: string): Promise<SessionUser> {
  return (await loadActiveUser(db, id))!;
}

/** A store with a clerk, a seller and a draft ticket with one line. */
async function counter() {
  const store = await makeStore(db);
  const clerk = await sessionUser((await makeUser(db, { role: 'clerk', storeId: store.id })).id);
  const seller = await makeSeller(db, store.id);
  const [ticket] = await db
    .insert(tickets)
    .values({ storeId: store.id, number: 1, sellerId: seller.id, clerkId: clerk.id, currency: 'USD' })
    .returning();
  const [line] = await db
    .insert(ticketLines)
    .values({ ticketId: ticket!.id, storeId: store.id, position: 1, input: { kind: 'jewelry' }, description: '14K chain' })
    .returning();
  return { store, clerk, seller, ticket: ticket!, line: line! };
}

async function photoRows(storeId: string) {
  return db.select().from(photos).where(eq(photos.storeId, storeId));
}

function context(user: SessionUser | null, request: Request, params: Record<string, string> = {}): APIContext {
  return { locals: { user }, request, params, url: new URL(request.url) } as unknown as APIContext;
}

function uploadRequest(fields: Record<string, string>, file?: { bytes: Uint8Array<ArrayBuffer>; name: string; type: string }): Request {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  if (file) form.set('file', new File([file.bytes], file.name, { type: file.type }));
  return new Request('http://127.0.0.1/api/photos', { method: 'POST', body: form });
}

describe('storing photos', () => {
  it('keeps a PNG of the ID and a JPEG of an item byte for byte, privately, with the row and an audit entry', async () => {
    const { store, clerk, seller, ticket, line } = await counter();

    const idPhoto = await storePhoto(db, clerk, { storeId: store.id, kind: 'id-document', sellerId: seller.id, bytes: PNG, declaredType: 'image/png' }, storage);
    const itemPhoto = await storePhoto(db, clerk, { storeId: store.id, kind: 'item', lineId: line.id, bytes: JPEG, declaredType: 'image/jpeg' }, storage);

    expect(idPhoto).toMatchObject({ kind: 'id-document', contentType: 'image/png', byteSize: PNG.byteLength, sellerId: seller.id, ticketId: null, url: `/api/photos/${idPhoto.id}` });
    expect(itemPhoto).toMatchObject({ kind: 'item', contentType: 'image/jpeg', byteSize: JPEG.byteLength, ticketId: ticket.id, lineId: line.id });

    const [idRow] = await db.select().from(photos).where(eq(photos.id, idPhoto.id));
    expect(idRow!.objectKey).toBe(`stores/${store.id}/id-document/${idPhoto.id}.png`);
    expect(idRow!.sha256).toBe(sha256(PNG));
    expect(idRow!.uploadedBy).toBe(clerk.id);

    const [itemRow] = await db.select().from(photos).where(eq(photos.id, itemPhoto.id));
    expect(itemRow!.objectKey).toBe(`stores/${store.id}/item/${itemPhoto.id}.jpg`);
    expect(await objectBytes(idRow!.objectKey)).toEqual(PNG);
    expect(await objectBytes(itemRow!.objectKey)).toEqual(JPEG);
    const head = await storage.client.send(new HeadObjectCommand({ Bucket: storage.bucket, Key: itemRow!.objectKey }));
    expect(head.ContentType).toBe('image/jpeg');
    expect(head.ContentLength).toBe(JPEG.byteLength);

    const back = await getPhoto(db, clerk, itemPhoto.id, storage);
    expect(back.contentType).toBe('image/jpeg');
    expect(await bytesOf(back.body)).toEqual(JPEG);

    const audit = await db.select().from(auditLog).where(and(eq(auditLog.storeId, store.id), eq(auditLog.action, 'photo.store')));
    expect(audit.map((a) => a.entityId).sort()).toEqual([idPhoto.id, itemPhoto.id].sort());
    expect(audit.find((a) => a.entityId === idPhoto.id)!.after).toMatchObject({ kind: 'id-document', sha256: sha256(PNG), byteSize: PNG.byteLength });

    expect((await listPhotos(db, store.id, { sellerId: seller.id })).map((p) => p.id)).toEqual([idPhoto.id]);
    expect((await listPhotos(db, store.id, { ticketId: ticket.id })).map((p) => p.id)).toEqual([itemPhoto.id]);
  });

  it('keeps a WebP and files an ID photo taken at a ticket under the ticket’s seller', async () => {
    const { store, clerk, seller, ticket } = await counter();
    const photo = await storePhoto(db, clerk, { storeId: store.id, kind: 'id-document', ticketId: ticket.id, bytes: WEBP }, storage);
    expect(photo).toMatchObject({ contentType: 'image/webp', sellerId: seller.id, ticketId: ticket.id });
    expect(await bytesOf((await getPhoto(db, clerk, photo.id, storage)).body)).toEqual(WEBP);
  });

  it('refuses a file whose bytes are not an image even when it is named and sent as a JPEG', async () => {
    const { store, clerk, seller } = await counter();
    const form = await readPhotoForm(uploadRequest({ kind: 'id-document' }, { bytes: NOT_AN_IMAGE, name: 'licence.jpg', type: 'image/jpeg' }));
    expect(form.file.declaredType).toBe('image/jpeg');
    await expect(
      storePhoto(db, clerk, { storeId: store.id, kind: 'id-document', sellerId: seller.id, bytes: form.file.bytes, declaredType: form.file.declaredType }, storage),
    ).rejects.toMatchObject({ status: 422, issues: [{ path: 'file', message: expect.stringContaining('not an image') }] });
    expect(await photoRows(store.id)).toHaveLength(0);
    expect(await keysUnder(storeObjectPrefix(store.id))).toEqual([]);
  });

  it('refuses a photo whose declared type disagrees with its content', async () => {
    const { store, clerk, seller } = await counter();
    await expect(storePhoto(db, clerk, { storeId: store.id, kind: 'item', sellerId: seller.id, bytes: PNG, declaredType: 'image/jpeg' }, storage)).rejects.toMatchObject({
      status: 422,
      issues: [{ path: 'file', message: 'The photo was refused: the file was sent as image/jpeg but its content is image/png' }],
    });
    expect(await photoRows(store.id)).toHaveLength(0);
  });

  it('takes exactly 10 MiB and refuses 10 MiB and one byte, and an empty file', async () => {
    const { store, clerk, seller } = await counter();
    const atLimit = new Uint8Array(MAX_PHOTO_BYTES);
    atLimit.set(PNG);
    const kept = await storePhoto(db, clerk, { storeId: store.id, kind: 'item', sellerId: seller.id, bytes: atLimit }, storage);
    expect(kept.byteSize).toBe(10_485_760);
    const [row] = await db.select().from(photos).where(eq(photos.id, kept.id));
    // The one big object is not kept: the fake's folder outlives the throwaway database.
    await storage.client.send(new DeleteObjectCommand({ Bucket: storage.bucket, Key: row!.objectKey }));

    const overLimit = new Uint8Array(MAX_PHOTO_BYTES + 1);
    overLimit.set(PNG);
    await expect(storePhoto(db, clerk, { storeId: store.id, kind: 'item', sellerId: seller.id, bytes: overLimit }, storage)).rejects.toMatchObject({
      status: 422,
      issues: [{ path: 'file', message: 'The photo is 10.0 MB; a photo may be at most 10 MB' }],
    });
    await expect(storePhoto(db, clerk, { storeId: store.id, kind: 'item', sellerId: seller.id, bytes: new Uint8Array(0) }, storage)).rejects.toMatchObject({
      status: 422,
      issues: [{ path: 'file', message: 'The photo was refused: the file is empty' }],
    });
    expect((await photoRows(store.id)).map((r) => r.id)).toEqual([kept.id]);
  });

  it('refuses another store’s seller, ticket and line with 404 naming the field', async () => {
    const here = await counter();
    const there = await counter();
    const base = { storeId: here.store.id, kind: 'item' as const, bytes: PNG };
    await expect(storePhoto(db, here.clerk, { ...base, sellerId: there.seller.id }, storage)).rejects.toMatchObject({ status: 404, issues: [{ path: 'sellerId' }] });
    await expect(storePhoto(db, here.clerk, { ...base, ticketId: there.ticket.id }, storage)).rejects.toMatchObject({ status: 404, issues: [{ path: 'ticketId' }] });
    await expect(storePhoto(db, here.clerk, { ...base, lineId: there.line.id }, storage)).rejects.toMatchObject({ status: 404, issues: [{ path: 'lineId' }] });
    await expect(storePhoto(db, here.clerk, { ...base, ticketId: here.ticket.id, sellerId: (await makeSeller(db, here.store.id)).id }, storage)).rejects.toMatchObject({
      status: 422,
      issues: [{ path: 'ticketId' }],
    });
    // A clerk cannot name another store at all.
    await expect(storePhoto(db, here.clerk, { ...base, storeId: there.store.id, sellerId: there.seller.id }, storage)).rejects.toMatchObject({ status: 403 });
    expect(await photoRows(here.store.id)).toHaveLength(0);
    expect(await photoRows(there.store.id)).toHaveLength(0);
    expect(await keysUnder(storeObjectPrefix(there.store.id))).toEqual([]);
  });

  it('leaves no object and no row when the database refuses the photo after the upload', async () => {
    const { store, clerk, line } = await counter();
    const fn = `refuse_photo_${unique('t').toLowerCase()}`;
    // Stands in for the line being deleted between the check and the insert.
    await owner.execute(
      sql.raw(`create function ${fn}() returns trigger language plpgsql as $$
        begin raise exception 'forced refusal' using errcode = '23503', constraint = 'photos_line_id_ticket_lines_id_fk'; end $$`),
    );
    await owner.execute(sql.raw(`create trigger ${fn} before insert on photos for each row when (new.store_id = '${store.id}') execute function ${fn}()`));
    try {
      await expect(storePhoto(db, clerk, { storeId: store.id, kind: 'item', lineId: line.id, bytes: PNG }, storage)).rejects.toMatchObject({
        cause: { code: '23503' },
      });
    } finally {
      await owner.execute(sql.raw(`drop trigger ${fn} on photos; drop function ${fn}()`));
    }
    expect(await photoRows(store.id)).toHaveLength(0);
    expect(await keysUnder(storeObjectPrefix(store.id))).toEqual([]);
    expect(await db.select().from(auditLog).where(eq(auditLog.storeId, store.id))).toHaveLength(0);
  });
});

describe('reading photos', () => {
  it('gives a photo to staff of its store and administrators, and “not found” to another store', async () => {
    const here = await counter();
    const there = await counter();
    const photo = await storePhoto(db, here.clerk, { storeId: here.store.id, kind: 'id-document', sellerId: here.seller.id, bytes: PNG }, storage);

    await expect(getPhoto(db, there.clerk, photo.id, storage)).rejects.toMatchObject({ status: 404 });
    const otherManager = await sessionUser((await makeUser(db, { role: 'manager', storeId: there.store.id })).id);
    await expect(getPhoto(db, otherManager, photo.id, storage)).rejects.toMatchObject({ status: 404 });
    await expect(getPhoto(db, here.clerk, 'no-such-photo', storage)).rejects.toMatchObject({ status: 404 });

    const sellerUser = await sessionUser((await makeUser(db, { role: 'seller', storeId: here.store.id, passwordHash: null })).id);
    await expect(getPhoto(db, sellerUser, photo.id, storage)).rejects.toMatchObject({ status: 403 });

    const admin = await sessionUser((await makeUser(db, { role: 'admin' })).id);
    expect(await bytesOf((await getPhoto(db, admin, photo.id, storage)).body)).toEqual(PNG);
    expect(await listPhotos(db, there.store.id, { sellerId: here.seller.id })).toEqual([]);
  });
});

describe('photo endpoints', () => {
  it('refuses the signed-out with 401 and sellers with 403, uploading nothing', async () => {
    const { store, seller } = await counter();
    const file = { bytes: PNG, name: 'id.png', type: 'image/png' };
    const anonymous = await postPhotoRoute(context(null, uploadRequest({ kind: 'id-document', sellerId: seller.id }, file)));
    expect(anonymous.status).toBe(401);
    expect(await anonymous.json()).toEqual({ error: 'Sign in first', issues: [] });

    const sellerUser = await sessionUser((await makeUser(db, { role: 'seller', storeId: store.id, passwordHash: null })).id);
    const refused = await postPhotoRoute(context(sellerUser, uploadRequest({ kind: 'id-document', sellerId: seller.id }, file)));
    expect(refused.status).toBe(403);
    expect(await photoRows(store.id)).toHaveLength(0);
  });

  it('stores an upload (201), lists it and serves it privately to staff only', async () => {
    const { store, clerk, seller } = await counter();
    const created = await postPhotoRoute(context(clerk, uploadRequest({ kind: 'id-document', sellerId: seller.id }, { bytes: JPEG, name: 'id.jpg', type: 'image/jpeg' })));
    expect(created.status).toBe(201);
    const { photo } = (await created.json()) as { photo: { id: string; kind: string; contentType: string; byteSize: number; url: string } };
    expect(photo).toMatchObject({ kind: 'id-document', contentType: 'image/jpeg', byteSize: JPEG.byteLength, url: `/api/photos/${photo.id}` });

    const listed = await listPhotosRoute(context(clerk, new Request(`http://127.0.0.1/api/photos?sellerId=${seller.id}`)));
    expect(listed.status).toBe(200);
    expect(((await listed.json()) as { photos: { id: string }[] }).photos.map((p) => p.id)).toEqual([photo.id]);

    const served = await getPhotoRoute(context(clerk, new Request(`http://127.0.0.1${photo.url}`), { id: photo.id }));
    expect(served.status).toBe(200);
    expect(served.headers.get('content-type')).toBe('image/jpeg');
    expect(served.headers.get('cache-control')).toBe('private, no-store');
    expect(served.headers.get('x-content-type-options')).toBe('nosniff');
    expect(new Uint8Array(await served.arrayBuffer())).toEqual(JPEG);

    const anonymous = await getPhotoRoute(context(null, new Request(`http://127.0.0.1${photo.url}`), { id: photo.id }));
    expect(anonymous.status).toBe(401);
    expect(anonymous.headers.get('content-type')).toMatch(/^application\/json/);
    const sellerUser = await sessionUser((await makeUser(db, { role: 'seller', storeId: store.id, passwordHash: null })).id);
    expect((await getPhotoRoute(context(sellerUser, new Request(`http://127.0.0.1${photo.url}`), { id: photo.id }))).status).toBe(403);
    const elsewhere = await counter();
    const otherStore = await getPhotoRoute(context(elsewhere.clerk, new Request(`http://127.0.0.1${photo.url}`), { id: photo.id }));
    expect(otherStore.status).toBe(404);
  });

  it('answers bad uploads with 400/422 naming the field, never 500', async () => {
    const { store, clerk, seller } = await counter();
    const notMultipart = await postPhotoRoute(
      context(clerk, new Request('http://127.0.0.1/api/photos', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"kind":"item"}' })),
    );
    expect(notMultipart.status).toBe(400);
    expect(((await notMultipart.json()) as { issues: { path: string }[] }).issues.map((i) => i.path)).toEqual(['file']);

    const noFile = await postPhotoRoute(context(clerk, uploadRequest({ kind: 'item', sellerId: seller.id })));
    expect(noFile.status).toBe(422);
    expect(((await noFile.json()) as { issues: { path: string }[] }).issues.map((i) => i.path)).toEqual(['file']);

    const badKind = await postPhotoRoute(context(clerk, uploadRequest({ kind: 'selfie', sellerId: seller.id }, { bytes: PNG, name: 'a.png', type: 'image/png' })));
    expect(badKind.status).toBe(422);
    expect(((await badKind.json()) as { issues: { path: string }[] }).issues.map((i) => i.path)).toEqual(['kind']);

    const textAsJpeg = await postPhotoRoute(context(clerk, uploadRequest({ kind: 'item', sellerId: seller.id }, { bytes: NOT_AN_IMAGE, name: 'ring.jpg', type: 'image/jpeg' })));
    expect(textAsJpeg.status).toBe(422);
    expect(((await textAsJpeg.json()) as { issues: { path: string }[] }).issues.map((i) => i.path)).toEqual(['file']);

    const huge = await postPhotoRoute(
      context(clerk, uploadRequest({ kind: 'item', sellerId: seller.id }, { bytes: new Uint8Array(MAX_PHOTO_BYTES + 128 * 1024), name: 'big.png', type: 'image/png' })),
    );
    expect(huge.status).toBe(422);
    expect(((await huge.json()) as { issues: { path: string; message: string }[] }).issues).toEqual([{ path: 'file', message: 'The photo is larger than 10 MB; a photo may be at most 10 MB' }]);

    const unknownSeller = await postPhotoRoute(context(clerk, uploadRequest({ kind: 'item', sellerId: 'nobody' }, { bytes: PNG, name: 'a.png', type: 'image/png' })));
    expect(unknownSeller.status).toBe(404);
    expect(await photoRows(store.id)).toHaveLength(0);
  });
});
