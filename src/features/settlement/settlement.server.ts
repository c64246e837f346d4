import { and, eq } from 'drizzle-orm';
import type Stripe from 'stripe';
import { payments, sellerPayoutAccounts, sellers, stores, tickets } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import type { SessionUser } from '@/features/auth/users.server';
import { requireNoLivePayout } from '@/features/counter/tickets.server';
import { canTransition } from '@/features/counter/counter';
import { enqueueMail } from '@/features/mail/outbox.server';
import { onboardingLinkMail } from '@/features/mail/templates';
import { idempotencyKeys } from '@/features/payouts/payouts';
import { sendToProvider } from '@/features/payouts/sending.server';
import { AppError } from '@/lib/errors';
import { paymentProvider } from './provider.server';

export { idempotencyKeys } from '@/features/payouts/payouts';
export { applyPayoutOutcome } from '@/features/payouts/outcome.server';
export { reconcilePendingPayments, retryDueSends, sendToProvider } from '@/features/payouts/sending.server';

function appUrl(): string {
  return process.env.APP_URL ?? 'http://127.0.0.1:4321';
}

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
 * transfer and the payout with keys derived from that row, by whoever holds the row's send lease.
 * A double click, two tabs, a retry after a time-out or a restart all land on the same row and the
 * same keys, so the seller is paid once. An answer that settles nothing leaves the payment pending
 * (returned as such, with the last error); the worker sends it again.
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
