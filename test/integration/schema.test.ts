import { describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { auditLog, storeSettings, users } from '@/db/schema';
import { recordAudit } from '@/features/audit/audit.server';
import { makeSeller, makeStore, makeUser, pgErrorCode, testDb, unique } from '../support/db';

const db = testDb();
const CHECK = '23514';
const UNIQUE = '23505';
const NOT_NULL = '23502';
const FOREIGN_KEY = '23503';

describe('database constraints hold without the application', () => {
  it('refuses a second account with the same e-mail in another case', async () => {
    const email = `${unique('dup')}@example.test`;
    await makeUser(db, { role: 'clerk', email });
    expect(await pgErrorCode(() => makeUser(db, { role: 'clerk', email: email.toUpperCase() }))).toBe(UNIQUE);
  });

  it('refuses an unknown role', async () => {
    const code = await pgErrorCode(() => db.execute(sql`insert into users (id, name, email, role, password_hash) values ('x1', 'A', 'a@b.cd', 'owner', null)`));
    expect(code).toBe(CHECK);
  });

  it('refuses a password that is not a bcrypt hash', async () => {
    expect(await pgErrorCode(() => makeUser(db, { role: 'clerk', passwordHash: 'plain-text-password' }))).toBe(CHECK);
  });

  it('refuses a staff account without a password and a clerk without a store', async () => {
    expect(await pgErrorCode(() => makeUser(db, { role: 'manager', passwordHash: null }))).toBe(CHECK);
    const store = await makeStore(db);
    const code = await pgErrorCode(() => db.execute(sql`insert into users (id, name, email, role, password_hash, store_id) values (${unique('u')}, 'A', ${unique('a') + '@b.cd'}, 'clerk', null, null)`));
    expect(code).toBe(CHECK);
    expect(store.id).toBeTruthy();
  });

  it('lets a seller account exist without a password (portal link sign-in)', async () => {
    const u = await makeUser(db, { role: 'seller', passwordHash: null });
    expect(u.passwordHash).toBeNull();
  });

  it('refuses a malformed store code, currency and country', async () => {
    expect(await pgErrorCode(() => makeStore(db, { code: 'bad code' }))).toBe(CHECK);
    expect(await pgErrorCode(() => makeStore(db, { currency: 'dollars' }))).toBe(CHECK);
    expect(await pgErrorCode(() => makeStore(db, { country: 'USA' }))).toBe(CHECK);
  });

  it('refuses a seller without a legal name, with no contact, or with a blank ID number', async () => {
    const store = await makeStore(db);
    expect(await pgErrorCode(() => makeSeller(db, store.id, { legalName: '   ' }))).toBe(CHECK);
    expect(await pgErrorCode(() => makeSeller(db, store.id, { email: null, phone: null }))).toBe(CHECK);
    expect(await pgErrorCode(() => makeSeller(db, store.id, { idNumber: ' ' }))).toBe(CHECK);
  });

  it('refuses the same ID document twice in one store, and a do-not-buy flag without a reason', async () => {
    const store = await makeStore(db);
    await makeSeller(db, store.id, { idNumber: 'SAME-123' });
    expect(await pgErrorCode(() => makeSeller(db, store.id, { idNumber: 'SAME-123' }))).toBe(UNIQUE);
    expect(await pgErrorCode(() => makeSeller(db, store.id, { doNotBuy: true }))).toBe(CHECK);
  });

  it('refuses a seller in a store that does not exist', async () => {
    expect(await pgErrorCode(() => makeSeller(db, 'no-such-store'))).toBe(FOREIGN_KEY);
  });

  it('refuses a setting whose value does not match its declared type', async () => {
    const store = await makeStore(db);
    const insert = (valueType: 'integer' | 'boolean' | 'decimal', value: unknown) =>
      db.insert(storeSettings).values({ storeId: store.id, key: unique('k').toLowerCase(), valueType, value });
    expect(await pgErrorCode(() => insert('integer', 'ten'))).toBe(CHECK);
    expect(await pgErrorCode(() => insert('integer', 2.5))).toBe(CHECK);
    expect(await pgErrorCode(() => insert('boolean', 1))).toBe(CHECK);
    expect(await pgErrorCode(() => insert('decimal', 12.5))).toBe(CHECK);
    expect(await pgErrorCode(() => insert('decimal', '12.50'))).toBe('ok');
    expect(await pgErrorCode(() => insert('integer', 10))).toBe('ok');
  });

  it('keeps the audit log append-only: update, delete and truncate are refused', async () => {
    const store = await makeStore(db);
    await recordAudit(db, { storeId: store.id, actorUserId: null, action: 'test.append', entity: 'store', entityId: store.id, after: { a: 1 } });
    const [row] = await db.select().from(auditLog).where(eq(auditLog.entityId, store.id));
    expect(row?.action).toBe('test.append');
    expect(await pgErrorCode(() => db.update(auditLog).set({ action: 'test.changed' }).where(eq(auditLog.id, row!.id)))).toBe('42501');
    expect(await pgErrorCode(() => db.delete(auditLog).where(eq(auditLog.id, row!.id)))).toBe('42501');
    expect(await pgErrorCode(() => db.execute(sql`truncate audit_log`))).toBe('42501');
    const [still] = await db.select().from(auditLog).where(eq(auditLog.id, row!.id));
    expect(still?.action).toBe('test.append');
  });

  it('refuses an audit row without an action', async () => {
    expect(await pgErrorCode(() => db.execute(sql`insert into audit_log (action, entity, entity_id) values (null, 'x', 'y')`))).toBe(NOT_NULL);
  });

  it('stores users with timestamps set by the database', async () => {
    const u = await makeUser(db, { role: 'clerk' });
    const [row] = await db.select({ createdAt: users.createdAt, updatedAt: users.updatedAt }).from(users).where(eq(users.id, u.id));
    expect(row!.createdAt).toBeInstanceOf(Date);
    expect(Math.abs(row!.createdAt.getTime() - Date.now())).toBeLessThan(60_000);
  });
});
