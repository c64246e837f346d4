import { afterAll } from 'vitest';
import { createDb, type Db } from '@/db/client';
import { sellers, stores, users } from '@/db/schema';
import { hashPassword } from '@/features/auth/password';

function testUrl(name: 'DATABASE_URL' | 'MIGRATION_DATABASE_URL'): string {
  const url = process.env[name];
  if (!url) throw new Error(`${name} is not set: run the tests through ./docker-free-start.sh test`);
  if (!/cupel_test/.test(url)) throw new Error(`Refusing to run tests against ${url}: the database name must contain cupel_test`);
  return url;
}

/**
 * The throwaway test database set up by `./docker-free-start.sh test`, never the demo data,
 * reached as the application's own role: the rights the app has, no more.
 */
export function testDb(): Db {
  const handle = createDb(testUrl('DATABASE_URL'), { max: 4 });
  afterAll(() => handle.close());
  return handle.db;
}

/** The same database as the owner role that runs migrations, for the few tests that need DDL. */
export function ownerTestDb(): Db {
  const handle = createDb(testUrl('MIGRATION_DATABASE_URL'), { max: 2 });
  afterAll(() => handle.close());
  return handle.db;
}

let counter = 0;
export function unique(prefix: string): string {
  counter += 1;
  return `${prefix}${Date.now().toString(36)}${counter}${Math.floor(Math.random() * 1e6).toString(36)}`;
}

export async function makeStore(db: Db, overrides: Partial<typeof stores.$inferInsert> = {}) {
  const [row] = await db
    .insert(stores)
    .values({
      code: unique('S').toUpperCase().replace(/[^A-Z0-9]/g, '').slice(0, 12),
      name: 'Test Counter',
      chainName: 'Test Chain',
      addressLine1: '1 Test Way',
      city: 'Testville',
      region: 'TS',
      postalCode: '00000',
      country: 'US',
      ...overrides,
    })
    .returning();
  return row!;
}

// One hash for all factory users: bcrypt at cost 12 takes a quarter second each.
let cachedHash: Promise<string> | undefined;
export const FACTORY_PASSWORD = 'factory-password-2026';
function factoryHash() {
  cachedHash ??= hashPassword(FACTORY_PASSWORD);
  return cachedHash;
}

export async function makeUser(db: Db, overrides: Partial<typeof users.$inferInsert> & { role: (typeof users.$inferInsert)['role'] }) {
  const storeId = overrides.storeId ?? (overrides.role === 'admin' ? null : (await makeStore(db)).id);
  const [row] = await db
    .insert(users)
    .values({
      name: 'Test Person',
      email: `${unique('user')}@example.test`,
      passwordHash: await factoryHash(),
      ...overrides,
      storeId,
    })
    .returning();
  return row!;
}

export async function makeSeller(db: Db, storeId: string, overrides: Partial<typeof sellers.$inferInsert> = {}) {
  const [row] = await db
    .insert(sellers)
    .values({
      storeId,
      legalName: 'Pat Example',
      email: `${unique('seller')}@example.test`,
      idType: 'drivers-license',
      idNumber: unique('ID'),
      idIssuingRegion: 'TS',
      idExpiry: '2030-01-01',
      dateOfBirth: '1980-05-05',
      addressLine1: '2 Test Way',
      city: 'Testville',
      region: 'TS',
      postalCode: '00000',
      country: 'US',
      ...overrides,
    })
    .returning();
  return row!;
}

/** Runs a statement and returns the PostgreSQL error it failed with: code and message (code 'ok' when it did not fail). */
export async function pgError(run: () => Promise<unknown>): Promise<{ code: string; message: string }> {
  try {
    await run();
    return { code: 'ok', message: '' };
  } catch (err) {
    const e = err as { code?: string; message?: string; cause?: { code?: string; message?: string } };
    const source = e.code ? e : (e.cause ?? e);
    return { code: source.code ?? 'unknown', message: source.message ?? String(err) };
  }
}

/** Runs a statement and returns the PostgreSQL error code it failed with (or 'ok'). */
export async function pgErrorCode(run: () => Promise<unknown>): Promise<string> {
  try {
    await run();
    return 'ok';
  } catch (err) {
    const e = err as { code?: string; cause?: { code?: string } };
    return e.code ?? e.cause?.code ?? 'unknown';
  }
}
