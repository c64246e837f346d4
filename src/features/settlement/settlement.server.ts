import { and, eq, lt } from 'drizzle-orm';
import type Stripe from 'stripe';
import { payments, providerEvents, sellerPayoutAccounts, sellers, stores, tickets } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import type { SessionUser } from '@/features/auth/users.server';
import { markPaid, getTicketUnscoped, requireNoLivePayout } from '@/features/counter/tickets.server';
import { canTransition, ticketReference } from '@/features/counter/counter';
import { enqueueMail } from '@/features/mail/outbox.server';
import { onboardingLinkMail, payoutConfirmationMail } from '@/features/mail/templates';
import { moneyOf, type CurrencyCode } from '@/features/pricing/money';
import { AppError } from '@/lib/errors';
import { paymentProvider, webhookSecret } from './provider.server';

function appUrl(): string {
  return process.env.APP_URL ?? 'http://127.0.0.1:4321';
}

/** Idempotency keys come from Cupel's own records, so any retry of the same step asks the provider for the same thing. */
export const idempotencyKeys = {
  account: (sellerId: string) => `cupel-account-${sellerId}`,
  transfer: (paymentId: string) => `cupel-transfer-${paymentId}`,
  payout: (paymentId: string) => `cupel-payout-${paymentId}`,
};

function providerError(err: unknown): AppError {
  const e = err as { type?: string; message?: string; statusCode?: number; code?: string };
  if (e?.type === 'StripeConnectionError' || e?.type === 'StripeAPIError' || (e?.statusCode ?? 0) >= 500) {
    return new AppError(409, 'The payment provider did not answer. Nothing was paid twice: try again, or pay another way.', [{ path: 'provider', message: e?.message ?? 'unavailable' }]);
  }
  return new AppError(422, `The payment provider refused: ${e?.message ?? 'unknown error'}`, [{ path: 'provider', message: e?.code ?? e?.type ?? 'refused' }]);
}

// ---------------------------------------------------------------------------
// Payout accounts and onboarding
// ---------------------------------------------------------------------------

export async function payoutAccountOf(db: DbOrTx, sellerId: string) {
  const [row] = await db.select().from(sellerPayoutAccounts).where(eq(sellerPayoutAccounts.sellerId, sellerId));
  return row ?? null;
}

/**
 * Gives a seller a connected account at the provider (created once, keyed by the seller) and an
 * onboarding link, e-mailed through the outbox and returned for the seller-facing screen's QR code.
 */
export async function startOnboarding(db: Db, actor: SessionUser | null, sellerId: string, options: { returnPath?: string } = {}) {
  const [seller] = await db.select().from(sellers).where(eq(sellers.id, sellerId));
  if (!seller || (actor && actor.role !== 'admin' && actor.role !== 'seller' && seller.storeId !== actor.storeId)) throw new AppError(404, 'No such seller');
  const [store] = await db.select().from(stores).where(eq(stores.id, seller.storeId));
  const provider = paymentProvider();
  let account = await payoutAccountOf(db, sellerId);
  if (!account) {
    let created: Stripe.Account;
    try {
      created = await provider.accounts.create(
        {
          type: 'custom',
          country: seller.country,
          email: seller.email ?? undefined,
          business_type: 'individual',
          capabilities: { transfers: { requested: true } },
          metadata: { cupel_seller_id: seller.id, cupel_store_id: seller.storeId },
        },
        { idempotencyKey: idempotencyKeys.account(seller.id) },
      );
    } catch (err) {
      throw providerError(err);
    }
    await db.transaction(async (tx) => {
      await tx
        .insert(sellerPayoutAccounts)
        .values({ storeId: seller.storeId, sellerId: seller.id, providerAccountId: created.id })
        .onConflictDoNothing();
      await recordAudit(tx, { storeId: seller.storeId, actorUserId: actor?.id ?? null, action: 'payout-account.create', entity: 'seller', entityId: seller.id, after: { providerAccountId: created.id } });
    });
    account = (await payoutAccountOf(db, sellerId))!;
  }
  const returnUrl = `${appUrl()}${options.returnPath ?? '/portal/payout-account?onboarded=1'}`;
  let link: Stripe.AccountLink;
  try {
    link = await provider.accountLinks.create({ account: account.providerAccountId, type: 'account_onboarding', return_url: returnUrl, refresh_url: returnUrl });
  } catch (err) {
    throw providerError(err);
  }
  await db
    .update(sellerPayoutAccounts)
    .set({ onboardingUrl: link.url, onboardingUrlExpiresAt: new Date(link.expires_at * 1000) })
    .where(eq(sellerPayoutAccounts.id, account.id));
  if (seller.email) {
    await db.transaction(async (tx) => {
      await enqueueMail(tx, { storeId: seller.storeId, kind: 'onboarding-link', to: seller.email!, ...onboardingLinkMail({ storeName: store!.name, sellerName: seller.legalName, url: link.url }) });
      await recordAudit(tx, { storeId: seller.storeId, actorUserId: actor?.id ?? null, action: 'payout-account.onboarding-link', entity: 'seller', entityId: seller.id });
    });
  }
  return { url: link.url, account, emailed: !!seller.email };
}

/** Copies what the provider says of the account (payouts enabled, the masked card or bank account) into Cupel. */
export async function syncPayoutAccount(tx: DbOrTx, account: Stripe.Account): Promise<boolean> {
  const external = account.external_accounts?.data?.[0] as (Stripe.Card | Stripe.BankAccount | undefined) & { available_payout_methods?: string[] };
  const [updated] = await tx
    .update(sellerPayoutAccounts)
    .set({
      payoutsEnabled: !!account.payouts_enabled,
      externalAccountKind: external ? (external.object === 'card' ? 'card' : 'bank_account') : null,
      externalAccountLast4: external?.last4 ?? null,
      externalAccountLabel: external ? (external.object === 'card' ? `${(external as Stripe.Card).brand} card` : (external as Stripe.BankAccount).bank_name ?? 'Bank account') : null,
      instantAvailable: !!external?.available_payout_methods?.includes('instant'),
    })
    .where(eq(sellerPayoutAccounts.providerAccountId, account.id))
    .returning({ id: sellerPayoutAccounts.id });
  return !!updated;
}

export async function refreshPayoutAccount(db: Db, sellerId: string) {
  const account = await payoutAccountOf(db, sellerId);
  if (!account) return null;
  try {
    const remote = await paymentProvider().accounts.retrieve(account.providerAccountId);
    await syncPayoutAccount(db, remote);
  } catch {
    // the stored state stands until the provider answers
  }
  return payoutAccountOf(db, sellerId);
}

// ---------------------------------------------------------------------------
// Paying electronically
// ---------------------------------------------------------------------------

/**
 * Pays an accepted ticket to the seller's payout account. The payment row is written first (a
 * partial unique index allows one live payout per ticket), then the provider is asked for the
 * transfer and the payout with keys derived from that row. A double click, two tabs, a retry after a
 * time-out or a restart all land on the same row and the same keys, so the seller is paid once.
 */
export async function payElectronically(db: Db, actor: SessionUser, ticketId: string, options: { speed?: 'standard' | 'instant' } = {}) {
  const payment = await db.transaction(async (tx) => {
    const [ticket] = await tx.select().from(tickets).where(eq(tickets.id, ticketId)).for('update');
    if (!ticket || (actor.role !== 'admin' && ticket.storeId !== actor.storeId)) throw new AppError(404, 'No such ticket');
    const [existing] = await tx
      .select()
      .from(payments)
      .where(and(eq(payments.ticketId, ticketId), eq(payments.kind, 'payout'), eq(payments.state, 'pending'), eq(payments.method, 'electronic')));
    if (existing) return existing;
    if (!canTransition(ticket.state, 'pay')) throw new AppError(409, 'Only an accepted ticket can be paid');
    await requireNoLivePayout(tx, ticketId);
    const account = await payoutAccountOf(tx, ticket.sellerId);
    if (!account || !account.payoutsEnabled) {
      throw new AppError(409, 'The seller has no payout account yet: send the onboarding link and pay once it is set up', [{ path: 'payoutAccount', message: 'not onboarded' }]);
    }
    const speed = options.speed === 'instant' && account.instantAvailable ? 'instant' : 'standard';
    const [created] = await tx
      .insert(payments)
      .values({
        storeId: ticket.storeId,
        ticketId,
        kind: 'payout',
        method: 'electronic',
        state: 'pending',
        amountMinor: ticket.payoutMinor,
        currency: ticket.currency,
        providerAccountId: account.providerAccountId,
        payoutSpeed: speed,
        createdBy: actor.id,
      })
      .returning();
    await recordAudit(tx, { storeId: ticket.storeId, actorUserId: actor.id, action: 'payment.electronic-start', entity: 'ticket', entityId: ticketId, after: { paymentId: created!.id, amountMinor: ticket.payoutMinor, speed } });
    return created!;
  });
  return sendToProvider(db, payment.id);
}

/** The provider steps of a pending payment; safe to run again at any point, which is how retries and reconciliation work. */
export async function sendToProvider(db: Db, paymentId: string) {
  const [payment] = await db.select().from(payments).where(eq(payments.id, paymentId));
  if (!payment || payment.state !== 'pending' || payment.method !== 'electronic') return payment ?? null;
  const provider = paymentProvider();
  const currency = payment.currency.toLowerCase();
  try {
    const transfer = await provider.transfers.create(
      { amount: payment.amountMinor, currency, destination: payment.providerAccountId!, metadata: { cupel_payment_id: payment.id, cupel_ticket_id: payment.ticketId } },
      { idempotencyKey: idempotencyKeys.transfer(payment.id) },
    );
    const payout = await provider.payouts.create(
      { amount: payment.amountMinor, currency, method: payment.payoutSpeed ?? 'standard', metadata: { cupel_payment_id: payment.id, cupel_ticket_id: payment.ticketId } },
      { stripeAccount: payment.providerAccountId!, idempotencyKey: idempotencyKeys.payout(payment.id) },
    );
    await db.transaction(async (tx) => {
      await tx.update(payments).set({ providerTransferId: transfer.id, providerPayoutId: payout.id }).where(and(eq(payments.id, payment.id), eq(payments.state, 'pending')));
      await recordAudit(tx, { storeId: payment.storeId, actorUserId: null, action: 'payment.electronic-sent', entity: 'ticket', entityId: payment.ticketId, after: { paymentId: payment.id, transferId: transfer.id, payoutId: payout.id } });
    });
    if (payout.status === 'paid' || payout.status === 'failed') await applyPayoutOutcome(db, payout);
  } catch (err) {
    const e = err as { type?: string; statusCode?: number };
    const transient = e?.type === 'StripeConnectionError' || e?.type === 'StripeAPIError' || (e?.statusCode ?? 0) >= 500;
    if (!transient) {
      await failPayment(db, payment.id, `The payment provider refused: ${(err as Error).message}`);
      throw providerError(err);
    }
    // Left pending: the same request again, or the reconciliation job, completes it with the same keys.
    await db.transaction(async (tx) => {
      await recordAudit(tx, { storeId: payment.storeId, actorUserId: null, action: 'payment.electronic-retry-needed', entity: 'ticket', entityId: payment.ticketId, after: { paymentId: payment.id, error: String((err as Error).message).slice(0, 300) } });
    });
    throw providerError(err);
  }
  const [fresh] = await db.select().from(payments).where(eq(payments.id, payment.id));
  return fresh!;
}

async function failPayment(db: DbOrTx, paymentId: string, reason: string) {
  // On a transaction this runs as a savepoint, on the pool as its own transaction.
  await db.transaction(async (tx) => {
    const [p] = await tx.select().from(payments).where(eq(payments.id, paymentId)).for('update');
    if (!p || p.state !== 'pending') return;
    await tx.update(payments).set({ state: 'failed', failureReason: reason.slice(0, 500) }).where(eq(payments.id, paymentId));
    await recordAudit(tx, { storeId: p.storeId, actorUserId: null, action: 'payment.electronic-failed', entity: 'ticket', entityId: p.ticketId, after: { paymentId, reason } });
  });
}

/** The provider says a payout is paid or failed: a paid one completes the ticket; a failed one leaves it awaiting payment, with the reason. */
export async function applyPayoutOutcome(db: Db, payout: Stripe.Payout): Promise<'paid' | 'failed' | 'ignored'> {
  return db.transaction(async (tx) => {
    const [payment] = await tx
      .select()
      .from(payments)
      .where(payout.metadata?.cupel_payment_id ? eq(payments.id, payout.metadata.cupel_payment_id) : eq(payments.providerPayoutId, payout.id))
      .for('update');
    if (!payment || payment.state !== 'pending') return 'ignored';
    if (payout.status === 'paid') {
      await tx.update(payments).set({ state: 'completed', providerPayoutId: payout.id }).where(eq(payments.id, payment.id));
      const [ticket] = await tx.select().from(tickets).where(eq(tickets.id, payment.ticketId)).for('update');
      if (ticket && ticket.state === 'accepted') {
        await markPaid(tx, ticket, null, { method: 'electronic', paymentId: payment.id });
        const view = await getTicketUnscoped(tx, ticket.id);
        const account = await payoutAccountOf(tx, ticket.sellerId);
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
      }
      return 'paid';
    }
    if (payout.status === 'failed' || payout.status === 'canceled') {
      await failPayment(tx, payment.id, payout.failure_message ?? `Payout ${payout.status}${payout.failure_code ? ` (${payout.failure_code})` : ''}`);
      return 'failed';
    }
    return 'ignored';
  });
}

// ---------------------------------------------------------------------------
// Webhooks and reconciliation
// ---------------------------------------------------------------------------

/** Verifies and applies one webhook delivery. A bad signature is refused; an event seen before changes nothing. */
export async function handleWebhook(db: Db, rawBody: string, signature: string | null): Promise<{ status: 'applied' | 'duplicate' | 'ignored'; type: string }> {
  let event: Stripe.Event;
  try {
    event = paymentProvider().webhooks.constructEvent(rawBody, signature ?? '', webhookSecret());
  } catch {
    throw new AppError(400, 'Webhook signature does not verify', [{ path: 'stripe-signature', message: 'invalid signature' }]);
  }
  const [fresh] = await db.insert(providerEvents).values({ eventId: event.id, type: event.type }).onConflictDoNothing().returning({ id: providerEvents.eventId });
  if (!fresh) return { status: 'duplicate', type: event.type };
  try {
    switch (event.type) {
      case 'payout.paid':
      case 'payout.failed':
        await applyPayoutOutcome(db, event.data.object as Stripe.Payout);
        return { status: 'applied', type: event.type };
      case 'account.updated':
        await syncPayoutAccount(db, event.data.object as Stripe.Account);
        return { status: 'applied', type: event.type };
      default:
        return { status: 'ignored', type: event.type };
    }
  } catch (err) {
    // Forget the event so the provider's retry is applied.
    await db.delete(providerEvents).where(eq(providerEvents.eventId, event.id));
    throw err;
  }
}

/**
 * Asks the provider about payments pending longer than `olderThanMs`: one never sent (a crash
 * before the provider call) is sent with its keys; one sent is looked up and its outcome applied.
 */
export async function reconcilePendingPayments(db: Db, options: { olderThanMs?: number; now?: Date; limit?: number } = {}) {
  const now = options.now ?? new Date();
  const before = new Date(now.getTime() - (options.olderThanMs ?? 5 * 60_000));
  const pending = await db
    .select()
    .from(payments)
    .where(and(eq(payments.state, 'pending'), eq(payments.method, 'electronic'), lt(payments.createdAt, before)))
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
