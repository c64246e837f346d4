import { desc, eq, and, sql } from 'drizzle-orm';
import { auditLog, sellers, tickets, users } from '@/db/schema';
import type { DbOrTx } from '@/db/client';

export async function recentAuditEntries(db: DbOrTx, storeId: string, limit = 20) {
  return db
    .select({
      id: auditLog.id,
      action: auditLog.action,
      entity: auditLog.entity,
      entityId: auditLog.entityId,
      at: auditLog.at,
      actorName: users.name,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorUserId))
    .where(eq(auditLog.storeId, storeId))
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(limit);
}

export async function storeHeadcount(db: DbOrTx, storeId: string) {
  const [row] = await db
    .select({
      staff: sql<number>`count(*) filter (where ${users.role} <> 'seller' and ${users.active})::int`,
      sellerAccounts: sql<number>`count(*) filter (where ${users.role} = 'seller')::int`,
    })
    .from(users)
    .where(eq(users.storeId, storeId));
  const [s] = await db
    .select({ sellers: sql<number>`count(*)::int`, doNotBuy: sql<number>`count(*) filter (where ${sellers.doNotBuy})::int` })
    .from(sellers)
    .where(and(eq(sellers.storeId, storeId)));
  return { staff: row?.staff ?? 0, sellerAccounts: row?.sellerAccounts ?? 0, sellers: s?.sellers ?? 0, doNotBuy: s?.doNotBuy ?? 0 };
}

/** Today's purchases in the store's own calendar day: tickets paid, melt value, payout and margin, per currency. */
export async function intakeForDay(db: DbOrTx, storeId: string, timeZone: string, day: string) {
  const rows = await db
    .select({
      currency: tickets.currency,
      tickets: sql<number>`count(*)::int`,
      meltValueMinor: sql<string>`coalesce(sum(${tickets.meltValueMinor}), 0)`,
      payoutMinor: sql<string>`coalesce(sum(${tickets.payoutMinor}), 0)`,
    })
    .from(tickets)
    .where(and(eq(tickets.storeId, storeId), eq(tickets.state, 'paid'), sql`(${tickets.paidAt} at time zone ${timeZone})::date = ${day}::date`))
    .groupBy(tickets.currency);
  return rows.map((r) => {
    const melt = Number(r.meltValueMinor);
    const payout = Number(r.payoutMinor);
    return { currency: r.currency, tickets: r.tickets, meltValueMinor: melt, payoutMinor: payout, marginMinor: melt - payout };
  });
}
