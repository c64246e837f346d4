import { and, desc, eq, ilike, or, sql } from 'drizzle-orm';
import { sellers, stores, tickets } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import type { SessionUser } from '@/features/auth/users.server';
import { dayInZone, sellerProblems } from '@/features/counter/counter';
import type { SellerInput } from '@/features/counter/counter.schema';
import { getStoreSettings } from '@/features/settings/settings.server';
import { AppError } from '@/lib/errors';

/** The seller records linked to a portal account (one per store the person sells at). */
export async function sellerRecordsForUser(db: DbOrTx, userId: string) {
  return db
    .select({
      id: sellers.id,
      legalName: sellers.legalName,
      email: sellers.email,
      phone: sellers.phone,
      idType: sellers.idType,
      idNumber: sellers.idNumber,
      idExpiry: sellers.idExpiry,
      addressLine1: sellers.addressLine1,
      addressLine2: sellers.addressLine2,
      city: sellers.city,
      region: sellers.region,
      postalCode: sellers.postalCode,
      storeName: stores.name,
    })
    .from(sellers)
    .innerJoin(stores, eq(stores.id, sellers.storeId))
    .where(eq(sellers.userId, userId));
}


/** Search by name, phone, e-mail or ID number, within one store. */
export async function searchSellers(db: DbOrTx, storeId: string, query: string, limit = 20) {
  const q = query.trim();
  const digits = q.replace(/\D/g, '');
  const like = `%${q.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
  return db
    .select({
      id: sellers.id,
      legalName: sellers.legalName,
      phone: sellers.phone,
      email: sellers.email,
      idType: sellers.idType,
      idNumber: sellers.idNumber,
      idExpiry: sellers.idExpiry,
      doNotBuy: sellers.doNotBuy,
      city: sellers.city,
    })
    .from(sellers)
    .where(
      and(
        eq(sellers.storeId, storeId),
        q
          ? or(
              ilike(sellers.legalName, like),
              ilike(sellers.idNumber, like),
              ilike(sellers.email, like),
              digits.length >= 3 ? sql`regexp_replace(coalesce(${sellers.phone}, ''), '\\D', '', 'g') like ${'%' + digits + '%'}` : undefined,
            )
          : undefined,
      ),
    )
    .orderBy(sellers.legalName)
    .limit(limit);
}

export async function createSeller(db: Db, actor: SessionUser, storeId: string, input: SellerInput) {
  return db.transaction(async (tx) => {
    const [existing] = await tx
      .select({ id: sellers.id })
      .from(sellers)
      .where(
        and(
          eq(sellers.storeId, storeId),
          eq(sellers.idType, input.idType),
          eq(sellers.idIssuingRegion, input.idIssuingRegion),
          eq(sellers.idNumber, input.idNumber),
        ),
      );
    if (existing) {
      throw new AppError(409, 'A seller with this ID document is already on file: search for them instead', [{ path: 'idNumber', message: 'already on file' }]);
    }
    const [row] = await tx
      .insert(sellers)
      .values({ ...input, storeId })
      .returning();
    await recordAudit(tx, { storeId, actorUserId: actor.id, action: 'seller.create', entity: 'seller', entityId: row!.id, after: { legalName: row!.legalName, idType: row!.idType } });
    return row!;
  });
}

/** A seller with the store's rules applied today, and their recent tickets. */
export async function sellerAtCounter(db: DbOrTx, storeId: string, sellerId: string) {
  const [row] = await db
    .select({ seller: sellers, timeZone: stores.timeZone })
    .from(sellers)
    .innerJoin(stores, eq(stores.id, sellers.storeId))
    .where(and(eq(sellers.id, sellerId), eq(sellers.storeId, storeId)));
  if (!row) throw new AppError(404, 'No such seller');
  const settings = await getStoreSettings(db, storeId);
  const problems = sellerProblems(
    row.seller,
    {
      minimumAgeYears: settings['seller.minimum_age_years'],
      expiredIdBlocks: settings['seller.expired_id_blocks'],
      acceptedIdTypes: settings['seller.accepted_id_types'],
    },
    dayInZone(new Date(), row.timeZone),
  );
  const recentTickets = await db
    .select({ id: tickets.id, number: tickets.number, state: tickets.state, payoutMinor: tickets.payoutMinor, currency: tickets.currency, createdAt: tickets.createdAt })
    .from(tickets)
    .where(and(eq(tickets.sellerId, sellerId), eq(tickets.storeId, storeId)))
    .orderBy(desc(tickets.createdAt))
    .limit(10);
  return { seller: row.seller, problems, recentTickets };
}

export async function setDoNotBuy(db: Db, actor: SessionUser, storeId: string, sellerId: string, flag: boolean, reason: string | null) {
  if (actor.role !== 'manager' && actor.role !== 'admin') throw new AppError(403, 'Only a manager may change a do-not-buy flag');
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select({ doNotBuy: sellers.doNotBuy, reason: sellers.doNotBuyReason })
      .from(sellers)
      .where(and(eq(sellers.id, sellerId), eq(sellers.storeId, storeId)))
      .for('update');
    if (!before) throw new AppError(404, 'No such seller');
    await tx
      .update(sellers)
      .set({ doNotBuy: flag, doNotBuyReason: flag ? reason : null })
      .where(eq(sellers.id, sellerId));
    await recordAudit(tx, { storeId, actorUserId: actor.id, action: 'seller.do-not-buy', entity: 'seller', entityId: sellerId, before, after: { doNotBuy: flag, reason } });
  });
}
