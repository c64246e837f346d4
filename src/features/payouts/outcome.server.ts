import { eq } from 'drizzle-orm';
import type Stripe from 'stripe';
import { payments, tickets } from '@/db/schema';
import type { DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import { getTicketUnscoped, markPaid } from '@/features/counter/tickets.server';
import { ticketReference } from '@/features/counter/counter';
import { enqueueMail } from '@/features/mail/outbox.server';
import { payoutConfirmationMail } from '@/features/mail/templates';
import { moneyOf, type CurrencyCode } from '@/features/pricing/money';
import { sellerPayoutAccounts } from '@/db/schema';
import { paymentProvider } from '@/features/settlement/provider.server';
import { raisePaymentException } from './exceptions.server';
import { idempotencyKeys } from './payouts';
import type { PaymentRow } from './lease.server';

/** Marks a pending electronic payout failed, with the provider's reason; the ticket stays accepted and can be paid another way. */
export async function failPayment(db: DbOrTx, paymentId: string, reason: string): Promise<void> {
  // On a transaction this runs as a savepoint, on the pool as its own transaction.
  await db.transaction(async (tx) => {
    const [p] = await tx.select().from(payments).where(eq(payments.id, paymentId)).for('update');
    if (!p || p.state !== 'pending') return;
    await tx.update(payments).set({ state: 'failed', failureReason: reason.slice(0, 500), sendingSince: null, nextSendAt: null }).where(eq(payments.id, paymentId));
    await recordAudit(tx, { storeId: p.storeId, actorUserId: null, action: 'payment.electronic-failed', entity: 'ticket', entityId: p.ticketId, after: { paymentId, reason } });
  });
}

/**
 * Takes back the transfer of a payout that will not reach the seller (refused or failed), so the
 * money is not left on their account; one key per payment, so repeating it reverses once. Throws
 * when the provider does not confirm, and the caller leaves the payment pending.
 */
export async function returnTransfer(payment: PaymentRow, transferId: string): Promise<Stripe.TransferReversal | null> {
  const transfer = await paymentProvider().transfers.retrieve(transferId);
  const left = transfer.amount - transfer.amount_reversed;
  if (left <= 0) return null;
  return paymentProvider().transfers.createReversal(
    transferId,
    { amount: left, metadata: { cupel_returns_payment_id: payment.id, cupel_ticket_id: payment.ticketId } },
    { idempotencyKey: idempotencyKeys.transferReturn(payment.id) },
  );
}

/**
 * The provider says a payout is paid or failed. Paid on an accepted ticket completes the ticket; paid
 * on a ticket that is no longer accepted (voided meanwhile, or changed by hand) records the money as
 * gone and raises an exception for the manager instead of marking the ticket paid. Failed takes the
 * transfer back and leaves the ticket awaiting payment, with the reason.
 */
export async function applyPayoutOutcome(db: DbOrTx, payout: Stripe.Payout): Promise<'paid' | 'failed' | 'exception' | 'ignored'> {
  return db.transaction(async (tx) => {
    const [payment] = await tx
      .select()
      .from(payments)
      .where(payout.metadata?.cupel_payment_id ? eq(payments.id, payout.metadata.cupel_payment_id) : eq(payments.providerPayoutId, payout.id))
      .for('update');
    if (!payment || payment.state !== 'pending' || payment.kind !== 'payout') return 'ignored';
    if (payout.status === 'paid') {
      await tx
        .update(payments)
        .set({ state: 'completed', providerPayoutId: payout.id, completedAt: new Date(), sendingSince: null, nextSendAt: null })
        .where(eq(payments.id, payment.id));
      const [ticket] = await tx.select().from(tickets).where(eq(tickets.id, payment.ticketId)).for('update');
      if (!ticket || ticket.state !== 'accepted') {
        await raisePaymentException(tx, {
          storeId: payment.storeId,
          ticketId: payment.ticketId,
          paymentId: payment.id,
          kind: 'payout-on-closed-ticket',
          message: `The provider paid out ${moneyOf(payment.amountMinor, payment.currency as CurrencyCode).formatted} (payout ${payout.id}) on a ticket that is ${ticket?.state ?? 'missing'}, not accepted. The ticket was not marked paid: take the money back or record what was done.`,
          details: { payoutId: payout.id, ticketState: ticket?.state ?? null },
        });
        return 'exception';
      }
      await markPaid(tx, ticket, null, { method: 'electronic', paymentId: payment.id });
      const view = await getTicketUnscoped(tx, ticket.id);
      const [account] = await tx.select().from(sellerPayoutAccounts).where(eq(sellerPayoutAccounts.sellerId, ticket.sellerId));
      if (view.seller.email) {
        await enqueueMail(tx, {
          storeId: ticket.storeId,
          kind: 'payout-confirmation',
          to: view.seller.email,
          ...payoutConfirmationMail({
            storeName: view.store.name,
            reference: ticketReference(view.store.code, view.number),
            amount: moneyOf(payment.amountMinor, payment.currency as CurrencyCode).formatted,
            destination: account?.externalAccountLast4 ? `your ${account.externalAccountLabel ?? 'account'} ending ${account.externalAccountLast4}` : 'your payout account',
          }),
        });
      }
      return 'paid';
    }
    if (payout.status === 'failed' || payout.status === 'canceled') {
      // The money came back to the seller's provider account: take the transfer back before the payment counts as failed.
      if (payment.providerTransferId) await returnTransfer(payment, payment.providerTransferId);
      await failPayment(tx, payment.id, payout.failure_message ?? `Payout ${payout.status}${payout.failure_code ? ` (${payout.failure_code})` : ''}`);
      return 'failed';
    }
    return 'ignored';
  });
}
