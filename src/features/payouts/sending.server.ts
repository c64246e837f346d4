import { and, eq, isNotNull, isNull, lt, lte, or, sql } from 'drizzle-orm';
import { payments } from '@/db/schema';
import type { Db } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import { paymentProvider } from '@/features/settlement/provider.server';
import { AppError } from '@/lib/errors';
import { claimSend, releaseForRetry, type PaymentRow } from './lease.server';
import { applyPayoutOutcome, failPayment, returnTransfer } from './outcome.server';
import { classifyProviderError, idempotencyKeys, sendLeaseMs } from './payouts';
import { sendReversal } from './reversals.server';

export class ProviderRefused extends AppError {}

async function reload(db: Db, id: string): Promise<PaymentRow | null> {
  const [row] = await db.select().from(payments).where(eq(payments.id, id));
  return row ?? null;
}

/**
 * The provider steps of a pending electronic payout, under the send lease: the transfer, then the
 * payout, each with its key from the payment row. Safe to run again at any point: a transfer made by
 * an earlier try is replayed by its key, never made twice. An answer that settles nothing (no
 * answer, 409 key in use, 429, 5xx) leaves the payment pending and due again; only a refusal by the
 * provider fails it, after taking back a transfer already made. Throws ProviderRefused (422) then.
 */
export async function sendToProvider(db: Db, paymentId: string): Promise<PaymentRow | null> {
  const current = await reload(db, paymentId);
  if (current?.kind === 'reversal') return sendReversal(db, paymentId);
  const payment = await claimSend(db, paymentId);
  if (!payment) return reload(db, paymentId);
  const provider = paymentProvider();
  const currency = payment.currency.toLowerCase();
  const metadata = { cupel_payment_id: payment.id, cupel_ticket_id: payment.ticketId };
  let step = 'transfer';
  let transferId = payment.providerTransferId;
  try {
    const transfer = await provider.transfers.create(
      { amount: payment.amountMinor, currency, destination: payment.providerAccountId!, metadata },
      { idempotencyKey: idempotencyKeys.transfer(payment.id) },
    );
    transferId = transfer.id;
    if (payment.providerTransferId !== transfer.id) {
      // The transfer id is part of the payment's record: stored with its audit row, in one transaction.
      await db.transaction(async (tx) => {
        await tx.update(payments).set({ providerTransferId: transfer.id }).where(eq(payments.id, payment.id));
        await recordAudit(tx, { storeId: payment.storeId, actorUserId: null, action: 'payment.transfer-recorded', entity: 'ticket', entityId: payment.ticketId, after: { paymentId: payment.id, transferId: transfer.id, attempt: payment.sendAttempts } });
      });
    }
    step = 'payout';
    const payout = await provider.payouts.create(
      { amount: payment.amountMinor, currency, method: payment.payoutSpeed ?? 'standard', metadata },
      { stripeAccount: payment.providerAccountId!, idempotencyKey: idempotencyKeys.payout(payment.id) },
    );
    await db.transaction(async (tx) => {
      await tx
        .update(payments)
        .set({ providerPayoutId: payout.id, sendingSince: null, nextSendAt: null, lastError: null })
        .where(and(eq(payments.id, payment.id), eq(payments.state, 'pending')));
      await recordAudit(tx, { storeId: payment.storeId, actorUserId: null, action: 'payment.electronic-sent', entity: 'ticket', entityId: payment.ticketId, after: { paymentId: payment.id, transferId: transfer.id, payoutId: payout.id, attempt: payment.sendAttempts } });
    });
    if (payout.status === 'paid' || payout.status === 'failed') await applyPayoutOutcome(db, payout);
  } catch (err) {
    const failure = classifyProviderError(err);
    if (failure.kind === 'transient') {
      await releaseForRetry(db, payment, failure, step);
      return reload(db, payment.id);
    }
    // A refusal: nothing was done for this step. Take back a transfer already made, then fail the payment.
    if (step === 'payout' && transferId) {
      try {
        await returnTransfer(payment, transferId);
      } catch (returnErr) {
        await releaseForRetry(db, payment, classifyProviderError(returnErr), 'transfer return after a refused payout');
        return reload(db, payment.id);
      }
    }
    await failPayment(db, payment.id, `The payment provider refused the ${step}: ${failure.message}`);
    throw new ProviderRefused(422, `The payment provider refused: ${failure.message}`, [{ path: 'provider', message: failure.code ?? 'refused' }]);
  }
  return reload(db, payment.id);
}

/**
 * The worker's retry pass: electronic payouts never sent or left pending by an answer that settled
 * nothing, and reversals due at the provider, each once its backoff is over and no sender holds it.
 */
export async function retryDueSends(db: Db, options: { now?: Date; limit?: number } = {}) {
  const now = options.now ?? new Date();
  const leaseCutoff = new Date(now.getTime() - sendLeaseMs());
  const due = await db
    .select({ id: payments.id, kind: payments.kind })
    .from(payments)
    .where(
      and(
        eq(payments.state, 'pending'),
        eq(payments.method, 'electronic'),
        or(isNull(payments.sendingSince), lt(payments.sendingSince, leaseCutoff)),
        or(
          and(eq(payments.kind, 'payout'), isNull(payments.providerPayoutId), or(isNull(payments.nextSendAt), lte(payments.nextSendAt, now))),
          and(eq(payments.kind, 'reversal'), isNotNull(payments.nextSendAt), lte(payments.nextSendAt, now)),
        ),
      ),
    )
    .orderBy(sql`${payments.nextSendAt} nulls first`)
    .limit(options.limit ?? 50);
  const outcomes: { paymentId: string; outcome: string }[] = [];
  for (const p of due) {
    try {
      const after = p.kind === 'payout' ? await sendToProvider(db, p.id) : await sendReversal(db, p.id);
      outcomes.push({ paymentId: p.id, outcome: after?.state ?? 'missing' });
    } catch (err) {
      outcomes.push({ paymentId: p.id, outcome: `error: ${(err as Error).message}` });
    }
  }
  return outcomes;
}

/**
 * Asks the provider about payouts pending longer than `olderThanMs`: one never sent (a crash before
 * the provider call, or a call that settled nothing) is sent with its keys; one sent is looked up and
 * its outcome applied.
 */
export async function reconcilePendingPayments(db: Db, options: { olderThanMs?: number; now?: Date; limit?: number } = {}) {
  const now = options.now ?? new Date();
  const before = new Date(now.getTime() - (options.olderThanMs ?? 5 * 60_000));
  const pending = await db
    .select()
    .from(payments)
    .where(and(eq(payments.state, 'pending'), eq(payments.method, 'electronic'), eq(payments.kind, 'payout'), lt(payments.createdAt, before)))
    .limit(options.limit ?? 50);
  const outcomes: { paymentId: string; outcome: string }[] = [];
  for (const p of pending) {
    try {
      if (!p.providerPayoutId) {
        const after = await sendToProvider(db, p.id);
        outcomes.push({ paymentId: p.id, outcome: after?.state ?? 'missing' });
      } else {
        const payout = await paymentProvider().payouts.retrieve(p.providerPayoutId, {}, { stripeAccount: p.providerAccountId! });
        outcomes.push({ paymentId: p.id, outcome: await applyPayoutOutcome(db, payout) });
      }
    } catch (err) {
      outcomes.push({ paymentId: p.id, outcome: `error: ${(err as Error).message}` });
    }
  }
  return outcomes;
}
