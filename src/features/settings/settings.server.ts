import { and, eq, sql } from 'drizzle-orm';
import { storeSettings } from '@/db/schema';
import type { DbOrTx, Db } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import type { SessionUser } from '@/features/auth/users.server';
import { AppError } from '@/lib/errors';
import {
  SETTING_DEFINITIONS,
  SettingValueError,
  defaultSettings,
  isSettingKey,
  parseSettingValue,
  type SettingKey,
  type StoreSettings,
} from './settings';

/** The store's settings: saved values over the defaults. A saved value that no longer parses falls back to the default. */
export async function getStoreSettings(db: DbOrTx, storeId: string): Promise<StoreSettings> {
  // Read as text and parse here: the jsonb column mapping would parse a JSON string value a second time.
  const rows = await db
    .select({ key: storeSettings.key, valueText: sql<string>`${storeSettings.value}::text` })
    .from(storeSettings)
    .where(eq(storeSettings.storeId, storeId));
  const out = defaultSettings() as Record<string, unknown>;
  for (const row of rows) {
    if (!isSettingKey(row.key)) continue;
    try {
      out[row.key] = parseSettingValue(row.key, JSON.parse(row.valueText));
    } catch {
      // keep the default; the admin screen shows the saved value as invalid
    }
  }
  return out as StoreSettings;
}

export async function setStoreSetting(db: Db, actor: SessionUser, storeId: string, key: string, value: unknown): Promise<void> {
  if (!isSettingKey(key)) throw new AppError(422, `Unknown setting ${key}`, [{ path: 'key', message: 'unknown setting' }]);
  let parsed: unknown;
  try {
    parsed = parseSettingValue(key as SettingKey, value);
  } catch (err) {
    if (err instanceof SettingValueError) throw new AppError(422, err.message, [{ path: `value`, message: err.message }]);
    throw err;
  }
  const valueType = SETTING_DEFINITIONS[key as SettingKey].type;
  await db.transaction(async (tx) => {
    const [before] = await tx
      .select({ value: storeSettings.value })
      .from(storeSettings)
      .where(and(eq(storeSettings.storeId, storeId), eq(storeSettings.key, key)));
    await tx
      .insert(storeSettings)
      .values({ storeId, key, valueType, value: parsed, updatedBy: actor.id })
      .onConflictDoUpdate({ target: [storeSettings.storeId, storeSettings.key], set: { value: parsed, valueType, updatedBy: actor.id } });
    await recordAudit(tx, {
      storeId,
      actorUserId: actor.id,
      action: 'setting.update',
      entity: 'store_setting',
      entityId: `${storeId}:${key}`,
      before: before?.value ?? null,
      after: parsed,
    });
  });
}
