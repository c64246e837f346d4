import { and, eq, lte, sql } from 'drizzle-orm';
import type Stripe from 'stripe';
import { providerEvents } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { syncPayoutAccount } from '@/features/settlement/settlement.server';
import { paymentProvider, webhookSecret } from '@/features/settlement/provider.server';
import { AppError } from '@/lib/errors';
import { applyPayoutOutcome } from './outcome.server';
import { INBOX_MAX_ATTEMPTS, nextInboxDelayMs } from './payouts';
import { applyTransferReversed } from './reversals.server';

export type InboxStatus = 'applied' | 'duplicate' | 'stored';

/** Verifies a delivery's signature; a bad one is a 400 and nothing is stored. */
export function verifyWebhook(rawBody: string, signature: string | null): Stripe.Event {
  try {
    return paymentProvider().webhooks.constructEvent(rawBody, signature ?? '', webhookSecret());
  } catch {
    throw new AppError(400, 'Webhook signature does not verify', [{ path: 'stripe-signature', message: 'invalid signature' }]);
  }
}

/** Stores a verified event in the inbox, once per event id. True when it is new. */
export async function storeEvent(db: DbOrTx, event: Stripe.Event, rawBody: string): Promise<boolean> {
  const [row] = await db
    .insert(providerEvents)
    .values({ eventId: event.id, type: event.type, payload: rawBody, state: 'received' })
    .onConflictDoNothing()
    .returning({ id: providerEvents.eventId });
  return !!row;
}

/** What an event changes in Cupel, in the inbox row's transaction. Events Cupel does not use are applied as nothing. */
async function applyEvent(tx: DbOrTx, event: Stripe.Event): Promise<string> {
  switch (event.type) {
    case 'payout.paid':
    case 'payout.failed':
    case 'payout.canceled':
      return applyPayoutOutcome(tx, event.data.object as Stripe.Payout);
    case 'account.updated':
      return (await syncPayoutAccount(tx, event.data.object as Stripe.Account)) ? 'synced' : 'unknown-account';
    case 'transfer.reversed':
      return `reversals-confirmed:${await applyTransferReversed(tx, event.data.object as Stripe.Transfer)}`;
    default:
      return 'not-used';
  }
}

/**
 * Applies one stored event and marks it applied in the same transaction, so it is applied exactly
 * once: a crash before the commit leaves it received for the next try. Skips an event another
 * process is applying right now. A failure is kept on the row and tried again later with backoff.
 */
export async function applyStoredEvent(db: Db, eventId: string): Promise<'applied' | 'busy' | 'done' | 'failed'> {
  try {
    return await db.transaction(async (tx) => {
      const [row] = await tx
        .select()
        .from(providerEvents)
        .where(eq(providerEvents.eventId, eventId))
        .for('update', { skipLocked: true });
      if (!row) {
        const [exists] = await tx.select({ state: providerEvents.state }).from(providerEvents).where(eq(providerEvents.eventId, eventId));
        return exists ? 'busy' : 'done';
      }
      if (row.state !== 'received' || !row.payload) return 'done';
      const event = JSON.parse(row.payload) as Stripe.Event;
      await applyEvent(tx, event);
      await tx
        .update(providerEvents)
        .set({ state: 'applied', appliedAt: new Date(), attempts: sql`${providerEvents.attempts} + 1`, lastError: null })
        .where(eq(providerEvents.eventId, eventId));
      return 'applied' as const;
    });
  } catch (err) {
    const [row] = await db
      .update(providerEvents)
      .set({ attempts: sql`${providerEvents.attempts} + 1`, lastError: String((err as Error).message ?? err).slice(0, 500) })
      .where(and(eq(providerEvents.eventId, eventId), eq(providerEvents.state, 'received')))
      .returning({ attempts: providerEvents.attempts });
    if (row) {
      const dead = row.attempts >= INBOX_MAX_ATTEMPTS;
      await db
        .update(providerEvents)
        .set(dead ? { state: 'dead' } : { nextAttemptAt: new Date(Date.now() + nextInboxDelayMs(row.attempts)) })
        .where(eq(providerEvents.eventId, eventId));
    }
    return 'failed';
  }
}

/**
 * One webhook delivery: verified, stored, then applied. The provider gets its 2xx once the event is
 * stored; if applying fails or the process stops before it, the worker applies the stored event.
 * A delivery of an event already stored changes nothing (or finishes it, if it was never applied).
 */
export async function handleWebhook(db: Db, rawBody: string, signature: string | null): Promise<{ status: InboxStatus; type: string }> {
  const event = verifyWebhook(rawBody, signature);
  const fresh = await storeEvent(db, event, rawBody);
  const outcome = await applyStoredEvent(db, event.id);
  if (outcome === 'applied') return { status: 'applied', type: event.type };
  return { status: fresh ? 'stored' : 'duplicate', type: event.type };
}

/** The worker's pass over the inbox: events stored but not applied (a crash, or a failure now due again). */
export async function applyDueEvents(db: Db, options: { limit?: number; now?: Date } = {}) {
  const due = await db
    .select({ eventId: providerEvents.eventId })
    .from(providerEvents)
    .where(and(eq(providerEvents.state, 'received'), lte(providerEvents.nextAttemptAt, options.now ?? new Date())))
    .orderBy(providerEvents.receivedAt)
    .limit(options.limit ?? 100);
  const outcomes: { eventId: string; outcome: string }[] = [];
  for (const e of due) outcomes.push({ eventId: e.eventId, outcome: await applyStoredEvent(db, e.eventId) });
  return outcomes;
}
