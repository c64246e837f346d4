import { and, eq, sql } from 'drizzle-orm';
import { payments } from '@/db/schema';
import type { DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import { nextSendDelayMs, sendLeaseMs, type ProviderFailure } from './payouts';

export type PaymentRow = typeof payments.$inferSelect;

/**
 * Takes the send lease of a pending electronic payment: one sender at a time, whatever the number of
 * requests, tabs, app processes or worker ticks. A sender that dies keeps the lease until it runs out.
 * Returns the row when this caller holds the lease, null when someone else does, it is not pending,
 * or it is a payout the provider already accepted.
 */
export async function claimSend(db: DbOrTx, paymentId: string): Promise<PaymentRow | null> {
  const leaseMs = sendLeaseMs();
  const [row] = await db
    .update(payments)
    .set({ sendingSince: sql`now()`, sendAttempts: sql`${payments.sendAttempts} + 1` })
    .where(
      and(
        eq(payments.id, paymentId),
        eq(payments.state, 'pending'),
        eq(payments.method, 'electronic'),
        // A payout the provider has accepted is only looked up now (reconciliation), not sent again.
        sql`(${payments.kind} = 'reversal' or ${payments.providerPayoutId} is null)`,
        sql`(${payments.sendingSince} is null or ${payments.sendingSince} < now() - make_interval(secs => ${leaseMs / 1000}))`,
      ),
    )
    .returning();
  return row ?? null;
}

/** Gives the lease back after an answer that settles nothing: the payment stays pending and is due again after a backoff. */
export async function releaseForRetry(db: DbOrTx, payment: PaymentRow, failure: ProviderFailure, step: string): Promise<void> {
  const retryInMs = failure.kind === 'transient' ? nextSendDelayMs(payment.sendAttempts) : null;
  await db.transaction(async (tx) => {
    await tx
      .update(payments)
      .set({
        sendingSince: null,
        lastError: `${step}: ${failure.message}`.slice(0, 500),
        nextSendAt: retryInMs === null ? null : new Date(Date.now() + retryInMs),
      })
      .where(eq(payments.id, payment.id));
    await recordAudit(tx, {
      storeId: payment.storeId,
      actorUserId: null,
      action: `payment.${payment.kind === 'payout' ? 'electronic' : 'reversal'}-${failure.kind === 'transient' ? 'retry-needed' : 'refused'}`,
      entity: 'ticket',
      entityId: payment.ticketId,
      after: { paymentId: payment.id, step, status: failure.status, code: failure.code, error: failure.message.slice(0, 300), retryInMs },
    });
  });
}
