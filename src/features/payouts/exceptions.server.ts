import { and, asc, eq, isNull } from 'drizzle-orm';
import { paymentExceptions, payments, stores, tickets, type PAYMENT_EXCEPTION_KINDS } from '@/db/schema';
import type { DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';

/** Raises an exception for the manager, once per payment and kind, with an audit entry, in the caller's transaction. */
export async function raisePaymentException(
  tx: DbOrTx,
  input: { storeId: string; ticketId: string; paymentId: string; kind: (typeof PAYMENT_EXCEPTION_KINDS)[number]; message: string; details?: Record<string, unknown> },
): Promise<string | null> {
  const [row] = await tx
    .insert(paymentExceptions)
    .values({ storeId: input.storeId, ticketId: input.ticketId, paymentId: input.paymentId, kind: input.kind, message: input.message.slice(0, 1000) })
    .onConflictDoNothing()
    .returning({ id: paymentExceptions.id });
  if (!row) return null;
  await recordAudit(tx, {
    storeId: input.storeId,
    actorUserId: null,
    action: 'payment.exception-raised',
    entity: 'ticket',
    entityId: input.ticketId,
    after: { exceptionId: row.id, kind: input.kind, paymentId: input.paymentId, message: input.message, ...input.details },
  });
  return row.id;
}

/** Open exceptions of a store, oldest first, with the ticket they concern and the payment's figures. */
export async function openPaymentExceptions(db: DbOrTx, storeId: string) {
  return db
    .select({
      id: paymentExceptions.id,
      kind: paymentExceptions.kind,
      message: paymentExceptions.message,
      raisedAt: paymentExceptions.raisedAt,
      ticketId: paymentExceptions.ticketId,
      ticketNumber: tickets.number,
      ticketState: tickets.state,
      storeCode: stores.code,
      paymentId: paymentExceptions.paymentId,
      amountMinor: payments.amountMinor,
      currency: payments.currency,
    })
    .from(paymentExceptions)
    .innerJoin(tickets, eq(tickets.id, paymentExceptions.ticketId))
    .innerJoin(stores, eq(stores.id, paymentExceptions.storeId))
    .innerJoin(payments, eq(payments.id, paymentExceptions.paymentId))
    .where(and(eq(paymentExceptions.storeId, storeId), isNull(paymentExceptions.resolvedAt)))
    .orderBy(asc(paymentExceptions.raisedAt));
}
