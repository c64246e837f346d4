import { describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { auditLog } from '@/db/schema';
import { loadActiveUser } from '@/features/auth/users.server';
import { getStoreSettings, setStoreSetting } from '@/features/settings/settings.server';
import { makeStore, makeUser, testDb } from '../support/db';

const db = testDb();

describe('store settings', () => {
  it('gives the defaults for a new store and a saved value once set, per store', async () => {
    const a = await makeStore(db);
    const b = await makeStore(db);
    const manager = (await loadActiveUser(db, (await makeUser(db, { role: 'manager', storeId: a.id })).id))!;
    expect((await getStoreSettings(db, a.id))['hold.period_days']).toBe(10);
    await setStoreSetting(db, manager, a.id, 'hold.period_days', 21);
    expect((await getStoreSettings(db, a.id))['hold.period_days']).toBe(21);
    expect((await getStoreSettings(db, b.id))['hold.period_days']).toBe(10);
    const audit = await db.select().from(auditLog).where(and(eq(auditLog.storeId, a.id), eq(auditLog.action, 'setting.update')));
    expect(audit).toHaveLength(1);
    expect(audit[0]!.after).toBe(21);
  });

  it('reads back every kind of value as it was saved: integer, decimal string, boolean, list', async () => {
    const a = await makeStore(db);
    const manager = (await loadActiveUser(db, (await makeUser(db, { role: 'manager', storeId: a.id })).id))!;
    await setStoreSetting(db, manager, a.id, 'cash.limit_per_ticket', '900.00');
    await setStoreSetting(db, manager, a.id, 'seller.expired_id_blocks', false);
    await setStoreSetting(db, manager, a.id, 'seller.accepted_id_types', ['passport']);
    await setStoreSetting(db, manager, a.id, 'pricing.assumed_fineness', { '14K': '0.575' });
    const s = await getStoreSettings(db, a.id);
    expect(s['cash.limit_per_ticket']).toBe('900.00');
    expect(s['seller.expired_id_blocks']).toBe(false);
    expect(s['seller.accepted_id_types']).toEqual(['passport']);
    expect(s['pricing.assumed_fineness']).toEqual({ '14K': '0.575' });
  });

  it('refuses a wrong value with 422 naming the key, and saves nothing', async () => {
    const a = await makeStore(db);
    const manager = (await loadActiveUser(db, (await makeUser(db, { role: 'manager', storeId: a.id })).id))!;
    await expect(setStoreSetting(db, manager, a.id, 'hold.period_days', -3)).rejects.toMatchObject({ status: 422, message: expect.stringContaining('hold.period_days') });
    await expect(setStoreSetting(db, manager, a.id, 'cash.limit_per_ticket', 2500.5)).rejects.toMatchObject({ status: 422 });
    await expect(setStoreSetting(db, manager, a.id, 'no.such_key', 1)).rejects.toMatchObject({ status: 422 });
    expect((await getStoreSettings(db, a.id))['hold.period_days']).toBe(10);
    expect(await db.select().from(auditLog).where(eq(auditLog.storeId, a.id))).toHaveLength(0);
  });
});
