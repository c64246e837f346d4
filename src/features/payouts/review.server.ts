import { and, asc, eq } from 'drizzle-orm';
import { payments, stores, tickets } from '@/db/schema';
import type { DbOrTx } from '@/db/client';
import { ticketReference } from '@/features/counter/counter';
import { openPaymentExceptions } from './exceptions.server';

/** What the review page shows of electronic money: open exceptions and reversals still waiting for the provider or a manager. */
export async function payoutAttention(db: DbOrTx, storeId: string) {
  const exceptions = await openPaymentExceptions(db, storeId);
  const reversals = await db
    .select({
      id: payments.id,
      ticketId: payments.ticketId,
      ticketNumber: tickets.number,
      storeCode: stores.code,
      amountMinor: payments.amountMinor,
      currency: payments.currency,
      createdAt: payments.createdAt,
      lastError: payments.lastError,
      nextSendAt: payments.nextSendAt,
      sendAttempts: payments.sendAttempts,
    })
    .from(payments)
    .innerJoin(tickets, eq(tickets.id, payments.ticketId))
    .innerJoin(stores, eq(stores.id, payments.storeId))
    .where(and(eq(payments.storeId, storeId), eq(payments.kind, 'reversal'), eq(payments.state, 'pending')))
    .orderBy(asc(payments.createdAt));
  return {
    exceptions: exceptions.map((e) => ({ ...e, reference: ticketReference(e.storeCode, e.ticketNumber), raisedAt: e.raisedAt.toISOString() })),
    reversals: reversals.map((r) => ({
      ...r,
      reference: ticketReference(r.storeCode, r.ticketNumber),
      createdAt: r.createdAt.toISOString(),
      nextSendAt: r.nextSendAt?.toISOString() ?? null,
    })),
  };
}
export type PayoutAttention = Awaited<ReturnType<typeof payoutAttention>>;
