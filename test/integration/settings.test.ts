import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { and, eq, sql } from 'drizzle-orm';
import { auditLog, storeSettings } from '@/db/schema';
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

  it('migration 0008 moves saved rates of the old 18K-and-above band and the 800, 833 and 990 keys without changing a price', async () => {
    const a = await makeStore(db);
    const old = { basis: 'percent-of-melt', percent: '86' };
    const own = { basis: 'percent-of-melt', percent: '90' };
    await db.insert(storeSettings).values([
      { storeId: a.id, key: 'pricing.rates', valueType: 'json', value: { 'gold-jewelry-18k-and-above': old, 'gold-jewelry-24k': own, 'silver-scrap': old } },
      { storeId: a.id, key: 'pricing.assumed_fineness', valueType: 'json', value: { '990': '0.985', '800': '0.79', '833': '0.825', '14K': '0.575' } },
    ]);
    // Before the migration the schema already reads the old band's rate for its three parts.
    expect((await getStoreSettings(db, a.id))['pricing.rates']).toEqual({ 'gold-jewelry-18k-to-21k': old, 'gold-jewelry-22k-to-23k': old, 'gold-jewelry-24k': own, 'silver-scrap': old });
    const file = readFileSync(new URL('../../migrations/0008_split_karat_bands_and_metal_mark_keys.sql', import.meta.url), 'utf8');
    for (const statement of file.split('--> statement-breakpoint')) await db.execute(sql.raw(statement));
    const rows = await db.select().from(storeSettings).where(eq(storeSettings.storeId, a.id));
    const saved = Object.fromEntries(rows.map((r) => [r.key, r.value]));
    expect(saved['pricing.rates']).toEqual({ 'gold-jewelry-18k-to-21k': old, 'gold-jewelry-22k-to-23k': old, 'gold-jewelry-24k': own, 'silver-scrap': old });
    expect(saved['pricing.assumed_fineness']).toEqual({ AU990: '0.985', AG800: '0.79', AG833: '0.825', '14K': '0.575' });
    const s = await getStoreSettings(db, a.id);
    expect(s['pricing.assumed_fineness']).toEqual({ AU990: '0.985', AG800: '0.79', AG833: '0.825', '14K': '0.575' });
  });
});
