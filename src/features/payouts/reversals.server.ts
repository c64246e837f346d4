import { and, eq, isNull } from 'drizzle-orm';
import type Stripe from 'stripe';
import { paymentExceptions, payments } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import type { SessionUser } from '@/features/auth/users.server';
import { paymentProvider } from '@/features/settlement/provider.server';
import { AppError } from '@/lib/errors';
import { claimSend, releaseForRetry, type PaymentRow } from './lease.server';
import { classifyProviderError, idempotencyKeys } from './payouts';

/**
 * A pending reversal of a completed electronic payout. Nothing is counted as returned until the
 * provider confirms the transfer reversal or a manager records money recovered another way.
 * `sendNow` makes it due for the provider at once (a void); otherwise it waits for a manager.
 */
export async function createPendingReversal(tx: DbOrTx, payout: PaymentRow, createdBy: string, options: { sendNow: boolean }): Promise<PaymentRow> {
  const [row] = await tx
    .insert(payments)
    .values({
      storeId: payout.storeId,
      ticketId: payout.ticketId,
      kind: 'reversal',
      reversesPaymentId: payout.id,
      method: 'electronic',
      state: 'pending',
      amountMinor: payout.amountMinor,
      currency: payout.currency,
      providerAccountId: payout.providerAccountId,
      providerTransferId: payout.providerTransferId,
      createdBy,
      nextSendAt: options.sendNow ? new Date() : null,
    })
    .returning();
  await recordAudit(tx, {
    storeId: payout.storeId,
    actorUserId: createdBy,
    action: 'payment.reversal-pending',
    entity: 'ticket',
    entityId: payout.ticketId,
    after: { reversalId: row!.id, reversesPaymentId: payout.id, amountMinor: payout.amountMinor, transferId: payout.providerTransferId, sendNow: options.sendNow },
  });
  return row!;
}

/** Asks the provider to reverse the transfer behind a pending reversal; safe to repeat (one key per reversal row). */
export async function sendReversal(db: Db, reversalId: string): Promise<PaymentRow | null> {
  const claimed = await claimSend(db, reversalId);
  if (!claimed || claimed.kind !== 'reversal') {
    const [row] = await db.select().from(payments).where(eq(payments.id, reversalId));
    return row ?? null;
  }
  if (!claimed.providerTransferId) {
    await releaseForRetry(db, claimed, { kind: 'refused', status: null, code: 'no_transfer', message: 'The payout has no transfer at the provider to reverse: record how the money was recovered.' }, 'reversal');
    return (await db.select().from(payments).where(eq(payments.id, reversalId)))[0] ?? null;
  }
  try {
    const reversal = await paymentProvider().transfers.createReversal(
      claimed.providerTransferId,
      { amount: claimed.amountMinor, metadata: { cupel_payment_id: claimed.id, cupel_reverses_payment_id: claimed.reversesPaymentId ?? '', cupel_ticket_id: claimed.ticketId } },
      { idempotencyKey: idempotencyKeys.reversal(claimed.id) },
    );
    await confirmReversal(db, claimed.id, reversal.id);
  } catch (err) {
    await releaseForRetry(db, claimed, classifyProviderError(err), 'transfer reversal');
  }
  return (await db.select().from(payments).where(eq(payments.id, reversalId)))[0] ?? null;
}

/** The provider confirmed a transfer reversal (its answer, or the transfer.reversed event): the reversal is completed once. */
export async function confirmReversal(db: DbOrTx, reversalId: string, providerReversalId: string): Promise<boolean> {
  return db.transaction(async (tx) => {
    const [row] = await tx.select().from(payments).where(eq(payments.id, reversalId)).for('update');
    if (!row || row.kind !== 'reversal' || row.state !== 'pending') return false;
    await tx
      .update(payments)
      .set({ state: 'completed', providerReversalId, completedAt: new Date(), sendingSince: null, nextSendAt: null, lastError: null })
      .where(eq(payments.id, reversalId));
    await recordAudit(tx, {
      storeId: row.storeId,
      actorUserId: null,
      action: 'payment.reversal-confirmed',
      entity: 'ticket',
      entityId: row.ticketId,
      after: { reversalId, providerReversalId, amountMinor: row.amountMinor },
    });
    return true;
  });
}

/** A transfer.reversed event: completes each of Cupel's reversals the transfer lists. */
export async function applyTransferReversed(tx: DbOrTx, transfer: Stripe.Transfer): Promise<number> {
  let done = 0;
  for (const r of transfer.reversals?.data ?? []) {
    const id = r.metadata?.cupel_payment_id;
    if (id && (await confirmReversal(tx, id, r.id))) done += 1;
  }
  return done;
}

/** A manager records that the money of a pending reversal came back another way (cash handed back, a bank recall). */
export async function recordManualRecovery(db: Db, actor: SessionUser, reversalId: string, note: string) {
  if (actor.role !== 'manager' && actor.role !== 'admin') throw new AppError(403, 'Only a manager records a recovery');
  return db.transaction(async (tx) => {
    const [row] = await tx.select().from(payments).where(eq(payments.id, reversalId)).for('update');
    if (!row || row.kind !== 'reversal' || (actor.role !== 'admin' && row.storeId !== actor.storeId)) throw new AppError(404, 'No such reversal');
    if (row.state !== 'pending') throw new AppError(409, `This reversal is already ${row.state}`);
    if (row.sendingSince && Date.now() - row.sendingSince.getTime() < 60_000) {
      throw new AppError(409, 'The provider is being asked for this reversal right now: wait a minute and look again');
    }
    await tx
      .update(payments)
      .set({ state: 'completed', recoveryNote: note, completedBy: actor.id, completedAt: new Date(), nextSendAt: null, sendingSince: null })
      .where(eq(payments.id, reversalId));
    await recordAudit(tx, {
      storeId: row.storeId,
      actorUserId: actor.id,
      action: 'payment.reversal-recorded',
      entity: 'ticket',
      entityId: row.ticketId,
      before: { state: 'pending', lastError: row.lastError },
      after: { state: 'completed', reversalId, amountMinor: row.amountMinor, note },
    });
    return { id: reversalId, state: 'completed' as const };
  });
}

/**
 * A manager settles an open payout exception: ask the provider to take the money back (a pending
 * reversal, sent now), record that it came back another way, or close it with a note. Audited.
 */
export async function settlePaymentException(db: Db, actor: SessionUser, exceptionId: string, input: { action: 'reverse' | 'recovered' | 'resolve'; note: string }) {
  if (actor.role !== 'manager' && actor.role !== 'admin') throw new AppError(403, 'Only a manager settles a payment exception');
  const reversalId = await db.transaction(async (tx) => {
    const [ex] = await tx.select().from(paymentExceptions).where(eq(paymentExceptions.id, exceptionId)).for('update');
    if (!ex || (actor.role !== 'admin' && ex.storeId !== actor.storeId)) throw new AppError(404, 'No such payment exception');
    if (ex.resolvedAt) throw new AppError(409, 'This exception is already resolved');
    let created: PaymentRow | null = null;
    if (input.action !== 'resolve') {
      const [payout] = await tx.select().from(payments).where(eq(payments.id, ex.paymentId)).for('update');
      if (!payout || payout.state !== 'completed') throw new AppError(409, 'The payout is not completed: there is nothing to take back');
      const [existing] = await tx.select({ id: payments.id }).from(payments).where(and(eq(payments.reversesPaymentId, payout.id)));
      if (existing) throw new AppError(409, 'This payout already has a reversal', [{ path: 'action', message: 'reversal exists' }]);
      created = await createPendingReversal(tx, payout, actor.id, { sendNow: input.action === 'reverse' });
    }
    await tx
      .update(paymentExceptions)
      .set({ resolvedAt: new Date(), resolvedBy: actor.id, resolutionNote: input.note })
      .where(and(eq(paymentExceptions.id, exceptionId), isNull(paymentExceptions.resolvedAt)));
    await recordAudit(tx, {
      storeId: ex.storeId,
      actorUserId: actor.id,
      action: 'payment.exception-resolved',
      entity: 'ticket',
      entityId: ex.ticketId,
      before: { exceptionId, kind: ex.kind },
      after: { action: input.action, note: input.note, reversalId: created?.id ?? null },
    });
    return created?.id ?? null;
  });
  if (reversalId && input.action === 'recovered') await recordManualRecovery(db, actor, reversalId, input.note);
  if (reversalId && input.action === 'reverse') await sendReversal(db, reversalId);
  return { id: exceptionId, resolved: true, reversalId };
}

/** Reversals still waiting for the provider or a manager, for the review page. */
export async function pendingReversals(db: DbOrTx, storeId: string) {
  return db
    .select()
    .from(payments)
    .where(and(eq(payments.storeId, storeId), eq(payments.kind, 'reversal'), eq(payments.state, 'pending')));
}

/** A manager asks the provider again for a reversal it refused or has not confirmed. */
export async function retryReversal(db: Db, actor: SessionUser, reversalId: string) {
  if (actor.role !== 'manager' && actor.role !== 'admin') throw new AppError(403, 'Only a manager asks for a reversal again');
  const [row] = await db.select().from(payments).where(eq(payments.id, reversalId));
  if (!row || row.kind !== 'reversal' || (actor.role !== 'admin' && row.storeId !== actor.storeId)) throw new AppError(404, 'No such reversal');
  if (row.state !== 'pending') throw new AppError(409, `This reversal is already ${row.state}`);
  await db.update(payments).set({ nextSendAt: new Date() }).where(eq(payments.id, reversalId));
  const after = await sendReversal(db, reversalId);
  return { id: reversalId, state: after?.state ?? 'pending', lastError: after?.lastError ?? null };
}
