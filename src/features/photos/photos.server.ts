import { createHash, randomUUID } from 'node:crypto';
import { DeleteObjectCommand, GetObjectCommand, NoSuchKey, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { and, asc, eq, type SQL } from 'drizzle-orm';
import { fileTypeFromBuffer } from 'file-type';
import type { Db, DbOrTx } from '@/db/client';
import { photos, sellers, ticketLines, tickets } from '@/db/schema';
import { recordAudit } from '@/features/audit/audit.server';
import { ROLE_GROUPS } from '@/features/auth/roles';
import type { SessionUser } from '@/features/auth/users.server';
import { AppError } from '@/lib/errors';
import {
  MAX_PHOTO_BYTES,
  checkPhotoType,
  describeSize,
  photoObjectKey,
  photoSizeProblem,
  photoUrl,
  type PhotoContentType,
  type PhotoKind,
} from './photos';

// --- Storage ----------------------------------------------------------------

export interface PhotoStorage {
  client: S3Client;
  bucket: string;
}

const STORAGE_ENV = ['S3_ENDPOINT', 'S3_REGION', 'S3_BUCKET', 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY'] as const;

export function createPhotoStorage(env: Record<string, string | undefined> = process.env): PhotoStorage {
  const missing = STORAGE_ENV.filter((name) => !env[name]);
  if (missing.length) throw new Error(`Photo storage is not configured: ${missing.join(', ')} not set`);
  const client = new S3Client({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    // Path-style (endpoint/bucket/key) works with every S3-compatible service, the local fake included.
    forcePathStyle: true,
    credentials: { accessKeyId: env.S3_ACCESS_KEY_ID!, secretAccessKey: env.S3_SECRET_ACCESS_KEY! },
  });
  return { client, bucket: env.S3_BUCKET! };
}

let shared: PhotoStorage | undefined;

/** The app's one S3 client, created on first use from the S3_* environment. */
export function photoStorage(): PhotoStorage {
  shared ??= createPhotoStorage();
  return shared;
}

// --- Reading an upload --------------------------------------------------------

/** Room for the multipart envelope and the text fields around a photo of the largest size. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;
const FORM_FIELDS = ['kind', 'storeId', 'sellerId', 'ticketId', 'lineId'] as const;

export interface PhotoForm {
  fields: Partial<Record<(typeof FORM_FIELDS)[number], unknown>>;
  file: { bytes: Uint8Array; declaredType: string | undefined; name: string };
}

function fileError(status: 400 | 422, message: string): AppError {
  return new AppError(status, message, [{ path: 'file', message }]);
}

function tooLarge(byteSize?: number): AppError {
  const size = byteSize === undefined ? 'larger than 10 MB' : describeSize(byteSize);
  return fileError(422, `The photo is ${size}; a photo may be at most 10 MB`);
}

/**
 * Reads a multipart/form-data upload with its `file` part, refusing a body larger than a photo
 * may be before it is all in memory.
 */
export async function readPhotoForm(request: Request): Promise<PhotoForm> {
  const contentType = request.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data\s*;/i.test(contentType)) {
    throw fileError(400, 'Send the photo as multipart/form-data with a field named file');
  }
  const limit = MAX_PHOTO_BYTES + MULTIPART_OVERHEAD_BYTES;
  const declaredLength = Number(request.headers.get('content-length') ?? NaN);
  if (Number.isFinite(declaredLength) && declaredLength > limit) throw tooLarge();

  const body = await readLimited(request, limit);
  let form: FormData;
  try {
    form = await new Response(body, { headers: { 'content-type': contentType } }).formData();
  } catch {
    throw fileError(400, 'The multipart body could not be read; send the photo in a field named file');
  }

  const files = form.getAll('file');
  if (files.length === 0) throw fileError(422, 'file is required: attach the photo in a field named file');
  if (files.length > 1) throw fileError(422, 'Send one photo per request');
  const file = files[0]!;
  if (typeof file === 'string') throw fileError(422, 'file must be a file, not text');

  const fields: PhotoForm['fields'] = {};
  for (const name of FORM_FIELDS) {
    const value = form.get(name);
    if (value !== null) fields[name] = value;
  }
  return {
    fields,
    file: { bytes: new Uint8Array(await file.arrayBuffer()), declaredType: file.type || undefined, name: file.name },
  };
}

async function readLimited(request: Request, limit: number): Promise<Uint8Array<ArrayBuffer>> {
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => {});
      throw tooLarge();
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    out.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return out;
}

// --- Services -----------------------------------------------------------------

export interface StorePhotoInput {
  storeId: string;
  kind: PhotoKind;
  sellerId?: string;
  ticketId?: string;
  lineId?: string;
  bytes: Uint8Array;
  /** The type the sender claimed; refused when the content says otherwise. */
  declaredType?: string | null;
}

export interface PhotoSummary {
  id: string;
  kind: PhotoKind;
  contentType: PhotoContentType;
  byteSize: number;
  sellerId: string | null;
  ticketId: string | null;
  lineId: string | null;
  createdAt: string;
  url: string;
}

type PhotoRow = typeof photos.$inferSelect;

function summary(row: PhotoRow): PhotoSummary {
  return {
    id: row.id,
    kind: row.kind,
    contentType: row.contentType as PhotoContentType,
    byteSize: row.byteSize,
    sellerId: row.sellerId,
    ticketId: row.ticketId,
    lineId: row.lineId,
    createdAt: row.createdAt.toISOString(),
    url: photoUrl(row.id),
  };
}

function requireStaff(user: SessionUser): void {
  if (!(ROLE_GROUPS.staff as readonly string[]).includes(user.role)) throw new AppError(403, 'Your role may not see or add photos');
}

function notFound(path: string, what: string): AppError {
  return new AppError(404, `No such ${what} in this store`, [{ path, message: `no such ${what} in this store` }]);
}

/** Checks that what the photo is attached to exists in the store and hangs together. */
async function resolveAttachments(db: DbOrTx, storeId: string, input: StorePhotoInput) {
  let { sellerId, ticketId } = input;
  const { lineId } = input;
  if (lineId) {
    const [line] = await db
      .select({ ticketId: ticketLines.ticketId })
      .from(ticketLines)
      .where(and(eq(ticketLines.id, lineId), eq(ticketLines.storeId, storeId)));
    if (!line) throw notFound('lineId', 'ticket line');
    if (ticketId && ticketId !== line.ticketId) {
      throw new AppError(422, 'That line is not on that ticket', [{ path: 'lineId', message: 'not a line of the given ticket' }]);
    }
    ticketId = line.ticketId;
  }
  if (ticketId) {
    const [ticket] = await db
      .select({ sellerId: tickets.sellerId })
      .from(tickets)
      .where(and(eq(tickets.id, ticketId), eq(tickets.storeId, storeId)));
    if (!ticket) throw notFound('ticketId', 'ticket');
    if (sellerId && sellerId !== ticket.sellerId) {
      throw new AppError(422, 'That ticket is not that seller’s', [{ path: 'ticketId', message: 'belongs to another seller' }]);
    }
    // An ID document is the seller's, whichever ticket it was taken at.
    if (input.kind === 'id-document') sellerId = ticket.sellerId;
  }
  if (sellerId && !ticketId) {
    const [seller] = await db
      .select({ id: sellers.id })
      .from(sellers)
      .where(and(eq(sellers.id, sellerId), eq(sellers.storeId, storeId)));
    if (!seller) throw notFound('sellerId', 'seller');
  }
  if (!sellerId && !ticketId) {
    throw new AppError(422, 'A photo belongs to a seller or a ticket', [{ path: 'sellerId', message: 'give sellerId or ticketId' }]);
  }
  return { sellerId: sellerId ?? null, ticketId: ticketId ?? null, lineId: lineId ?? null };
}

/**
 * Keeps a photo: checks its size and (by content) its type and what it is attached to, puts it in
 * the private bucket, then records the row and the audit entry in one transaction. If the database
 * refuses, the object is removed again so nothing is left half-written.
 */
export async function storePhoto(
  db: Db,
  actor: SessionUser,
  input: StorePhotoInput,
  storage: PhotoStorage = photoStorage(),
): Promise<PhotoSummary> {
  requireStaff(actor);
  if (actor.role !== 'admin' && actor.storeId !== input.storeId) throw new AppError(403, 'That store is not yours');

  const sizeProblem = photoSizeProblem(input.bytes.byteLength);
  if (sizeProblem) {
    throw input.bytes.byteLength > MAX_PHOTO_BYTES ? tooLarge(input.bytes.byteLength) : fileError(422, `The photo was refused: ${sizeProblem}`);
  }
  const detected = await fileTypeFromBuffer(input.bytes);
  const type = checkPhotoType(detected?.mime, input.declaredType);
  if (!type.ok) throw fileError(422, `The photo was refused: ${type.message}`);

  const attachments = await resolveAttachments(db, input.storeId, input);

  const id = randomUUID();
  const objectKey = photoObjectKey(input.storeId, input.kind, type.contentType, id);
  const sha256 = createHash('sha256').update(input.bytes).digest('hex');

  // No ACL is sent: objects stay private to the bucket owner, and buckets with ACLs disabled refuse one.
  await storage.client.send(
    new PutObjectCommand({
      Bucket: storage.bucket,
      Key: objectKey,
      Body: input.bytes,
      ContentType: type.contentType,
      ContentLength: input.bytes.byteLength,
      Metadata: { 'photo-id': id, 'store-id': input.storeId, sha256 },
    }),
  );

  try {
    const row = await db.transaction(async (tx) => {
      const [inserted] = await tx
        .insert(photos)
        .values({
          id,
          storeId: input.storeId,
          kind: input.kind,
          ...attachments,
          objectKey,
          contentType: type.contentType,
          byteSize: input.bytes.byteLength,
          sha256,
          uploadedBy: actor.id,
        })
        .returning();
      await recordAudit(tx, {
        storeId: input.storeId,
        actorUserId: actor.id,
        action: 'photo.store',
        entity: 'photo',
        entityId: id,
        after: { kind: input.kind, ...attachments, contentType: type.contentType, byteSize: input.bytes.byteLength, sha256 },
      });
      return inserted!;
    });
    return summary(row);
  } catch (err) {
    await storage.client.send(new DeleteObjectCommand({ Bucket: storage.bucket, Key: objectKey })).catch((deleteErr: unknown) => {
      console.error(`photo ${id}: the database refused the row and the object ${objectKey} could not be removed`, deleteErr);
    });
    throw err;
  }
}

export interface PhotoContent {
  photo: PhotoSummary;
  contentType: PhotoContentType;
  byteSize: number;
  body: ReadableStream<Uint8Array>;
}

/** A photo's bytes, for staff of its store (administrators: any store). Any other photo is "not found". */
export async function getPhoto(
  db: DbOrTx,
  user: SessionUser,
  photoId: string,
  storage: PhotoStorage = photoStorage(),
): Promise<PhotoContent> {
  requireStaff(user);
  const [row] = await db.select().from(photos).where(eq(photos.id, photoId));
  if (!row || (user.role !== 'admin' && row.storeId !== user.storeId)) {
    throw new AppError(404, 'No such photo', [{ path: 'id', message: 'no such photo' }]);
  }
  let object;
  try {
    object = await storage.client.send(new GetObjectCommand({ Bucket: storage.bucket, Key: row.objectKey }));
  } catch (err) {
    if (err instanceof NoSuchKey) {
      console.error(`photo ${row.id}: its object ${row.objectKey} is missing from storage`);
      throw new AppError(404, 'The photo’s file is missing from storage', [{ path: 'id', message: 'file missing from storage' }]);
    }
    throw err;
  }
  if (!object.Body) throw new Error(`photo ${row.id}: storage returned no body`);
  return {
    photo: summary(row),
    contentType: row.contentType as PhotoContentType,
    byteSize: row.byteSize,
    body: object.Body.transformToWebStream() as ReadableStream<Uint8Array>,
  };
}

/** The store's photos of a seller and/or a ticket, oldest first. */
export async function listPhotos(db: DbOrTx, storeId: string, filter: { sellerId?: string; ticketId?: string }): Promise<PhotoSummary[]> {
  const conditions: SQL[] = [eq(photos.storeId, storeId)];
  if (filter.sellerId) conditions.push(eq(photos.sellerId, filter.sellerId));
  if (filter.ticketId) conditions.push(eq(photos.ticketId, filter.ticketId));
  const rows = await db
    .select()
    .from(photos)
    .where(and(...conditions))
    .orderBy(asc(photos.createdAt), asc(photos.id));
  return rows.map(summary);
}
