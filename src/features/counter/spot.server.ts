import { desc, eq } from 'drizzle-orm';
import { spotPrices, stores, users } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import type { SessionUser } from '@/features/auth/users.server';
import type { Metal } from '@/features/pricing/metals';
import { getStoreSettings } from '@/features/settings/settings.server';
import { AppError } from '@/lib/errors';
import { isSpotStale, type SpotEntry } from './counter';

/** The newest spot entry per metal for a store. */
export async function currentSpots(db: DbOrTx, storeId: string): Promise<Partial<Record<Metal, SpotEntry>>> {
  const rows = await db
    .selectDistinctOn([spotPrices.metal], {
      id: spotPrices.id,
      metal: spotPrices.metal,
      pricePerTroyOunce: spotPrices.pricePerTroyOunce,
      enteredAt: spotPrices.enteredAt,
      enteredByName: users.name,
    })
    .from(spotPrices)
    .leftJoin(users, eq(users.id, spotPrices.enteredBy))
    .where(eq(spotPrices.storeId, storeId))
    .orderBy(spotPrices.metal, desc(spotPrices.enteredAt), desc(spotPrices.id));
  const out: Partial<Record<Metal, SpotEntry>> = {};
  for (const r of rows) out[r.metal] = r;
  return out;
}

export async function spotHistory(db: DbOrTx, storeId: string, limit = 40) {
  return db
    .select({
      id: spotPrices.id,
      metal: spotPrices.metal,
      pricePerTroyOunce: spotPrices.pricePerTroyOunce,
      currency: spotPrices.currency,
      enteredAt: spotPrices.enteredAt,
      enteredByName: users.name,
    })
    .from(spotPrices)
    .leftJoin(users, eq(users.id, spotPrices.enteredBy))
    .where(eq(spotPrices.storeId, storeId))
    .orderBy(desc(spotPrices.enteredAt), desc(spotPrices.id))
    .limit(limit);
}

export interface SpotBoardEntry extends SpotEntry {
  stale: boolean;
}

export async function spotBoard(db: DbOrTx, storeId: string, now = new Date()) {
  const [spots, settings] = await Promise.all([currentSpots(db, storeId), getStoreSettings(db, storeId)]);
  const staleAfterMinutes = settings['spot.stale_after_minutes'];
  const board: Partial<Record<Metal, SpotBoardEntry>> = {};
  for (const [metal, entry] of Object.entries(spots) as [Metal, SpotEntry][]) {
    board[metal] = { ...entry, stale: isSpotStale(entry, staleAfterMinutes, now) };
  }
  return { spots: board, staleAfterMinutes };
}

/**
 * Records a spot price and re-prices the store's open tickets on it (drafts and shown offers);
 * accepted tickets keep the spot they were accepted on. One transaction.
 */
export async function enterSpot(
  db: Db,
  actor: SessionUser,
  storeId: string,
  input: { metal: Metal; pricePerTroyOunce: string },
  repriceOpenTickets: (tx: DbOrTx, storeId: string) => Promise<number>,
): Promise<{ id: string; repricedTickets: number }> {
  const settings = await getStoreSettings(db, storeId);
  if (actor.role === 'clerk' && !settings['spot.clerks_may_enter']) {
    throw new AppError(403, 'In this store only managers enter spot prices');
  }
  return db.transaction(async (tx) => {
    const [store] = await tx.select({ currency: stores.currency }).from(stores).where(eq(stores.id, storeId));
    if (!store) throw new AppError(404, 'No such store');
    const [row] = await tx
      .insert(spotPrices)
      .values({ storeId, metal: input.metal, pricePerTroyOunce: input.pricePerTroyOunce, currency: store.currency, enteredBy: actor.id })
      .returning({ id: spotPrices.id, enteredAt: spotPrices.enteredAt });
    await recordAudit(tx, {
      storeId,
      actorUserId: actor.id,
      action: 'spot.enter',
      entity: 'spot_price',
      entityId: row!.id,
      after: { metal: input.metal, pricePerTroyOunce: input.pricePerTroyOunce, currency: store.currency },
    });
    const repricedTickets = await repriceOpenTickets(tx, storeId);
    return { id: row!.id, repricedTickets };
  });
}
