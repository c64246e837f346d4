import { and, desc, eq, inArray } from 'drizzle-orm';
import { payments, sellers, stores, tickets, users } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import { hashPassword } from '@/features/auth/password';
import type { SessionUser } from '@/features/auth/users.server';
import { ticketReference, TICKET_STATE_LABELS } from '@/features/counter/counter';
import { getTicketUnscoped } from '@/features/counter/tickets.server';
import { buildReceipt } from '@/features/receipts/receipt';
import { refreshPayoutAccount, startOnboarding } from '@/features/settlement/settlement.server';
import { AppError } from '@/lib/errors';
import type { ContactUpdate } from './portal.schema';

/** A seller's portal account may stand for seller records in several stores. */
export async function sellerIdsOf(db: DbOrTx, user: SessionUser): Promise<string[]> {
  const rows = await db.select({ id: sellers.id }).from(sellers).where(eq(sellers.userId, user.id));
  return rows.map((r) => r.id);
}

/** Tickets the seller accepted (and later states), newest first, with their payments. Drafts and open offers are the counter's business. */
export async function listSettlements(db: DbOrTx, user: SessionUser) {
  const ids = await sellerIdsOf(db, user);
  if (!ids.length) return [];
  const rows = await db
    .select({
      id: tickets.id,
      number: tickets.number,
      state: tickets.state,
      currency: tickets.currency,
      meltValueMinor: tickets.meltValueMinor,
      payoutMinor: tickets.payoutMinor,
      acceptedAt: tickets.acceptedAt,
      paidAt: tickets.paidAt,
      holdUntil: tickets.holdUntil,
      storeCode: stores.code,
      storeName: stores.name,
    })
    .from(tickets)
    .innerJoin(stores, eq(stores.id, tickets.storeId))
    .where(and(inArray(tickets.sellerId, ids), inArray(tickets.state, ['accepted', 'paid', 'voided'])))
    .orderBy(desc(tickets.createdAt))
    .limit(200);
  const ticketIds = rows.map((r) => r.id);
  const pays = ticketIds.length
    ? await db
        .select({ ticketId: payments.ticketId, kind: payments.kind, method: payments.method, state: payments.state, amountMinor: payments.amountMinor, failureReason: payments.failureReason, createdAt: payments.createdAt })
        .from(payments)
        .where(inArray(payments.ticketId, ticketIds))
    : [];
  return rows.map((r) => ({
    ...r,
    reference: ticketReference(r.storeCode, r.number),
    stateLabel: TICKET_STATE_LABELS[r.state],
    payments: pays.filter((p) => p.ticketId === r.id).map(({ ticketId: _t, ...p }) => p),
  }));
}

/** One of the seller's own tickets as a receipt; any other id is 404, never another seller's data. */
export async function portalReceipt(db: DbOrTx, user: SessionUser, ticketId: string) {
  const ids = await sellerIdsOf(db, user);
  const [row] = await db
    .select({ sellerId: tickets.sellerId, state: tickets.state })
    .from(tickets)
    .where(eq(tickets.id, ticketId));
  if (!row || !ids.includes(row.sellerId) || !['accepted', 'paid', 'voided'].includes(row.state)) throw new AppError(404, 'No such receipt');
  return buildReceipt(await getTicketUnscoped(db, ticketId));
}

export async function portalPayoutAccounts(db: Db, user: SessionUser) {
  const records = await db
    .select({ id: sellers.id, storeName: stores.name })
    .from(sellers)
    .innerJoin(stores, eq(stores.id, sellers.storeId))
    .where(eq(sellers.userId, user.id));
  return Promise.all(
    records.map(async (r) => {
      const account = await refreshPayoutAccount(db, r.id);
      return {
        sellerId: r.id,
        storeName: r.storeName,
        onboarded: !!account?.payoutsEnabled,
        destination: account?.externalAccountLast4 ? `${account.externalAccountLabel ?? 'Account'} ending ${account.externalAccountLast4}` : null,
        instantAvailable: !!account?.instantAvailable,
      };
    }),
  );
}

export async function portalStartOnboarding(db: Db, user: SessionUser, sellerId: string) {
  const ids = await sellerIdsOf(db, user);
  if (!ids.includes(sellerId)) throw new AppError(404, 'No such seller record');
  return startOnboarding(db, user, sellerId, { returnPath: '/portal/payout-account?onboarded=1' });
}

export async function portalContact(db: DbOrTx, user: SessionUser) {
  return db
    .select({
      id: sellers.id,
      storeName: stores.name,
      legalName: sellers.legalName,
      email: sellers.email,
      phone: sellers.phone,
      addressLine1: sellers.addressLine1,
      addressLine2: sellers.addressLine2,
      city: sellers.city,
      region: sellers.region,
      postalCode: sellers.postalCode,
    })
    .from(sellers)
    .innerJoin(stores, eq(stores.id, sellers.storeId))
    .where(eq(sellers.userId, user.id));
}

export async function updatePortalContact(db: Db, user: SessionUser, sellerId: string, input: ContactUpdate) {
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select()
      .from(sellers)
      .where(and(eq(sellers.id, sellerId), eq(sellers.userId, user.id)))
      .for('update');
    if (!before) throw new AppError(404, 'No such seller record');
    await tx.update(sellers).set(input).where(eq(sellers.id, sellerId));
    await recordAudit(tx, {
      storeId: before.storeId,
      actorUserId: user.id,
      action: 'seller.contact-update',
      entity: 'seller',
      entityId: sellerId,
      before: { email: before.email, phone: before.phone, addressLine1: before.addressLine1, city: before.city },
      after: { email: input.email, phone: input.phone, addressLine1: input.addressLine1, city: input.city },
    });
  });
}

export async function setPortalPassword(db: Db, user: SessionUser, password: string) {
  const passwordHash = await hashPassword(password);
  await db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(and(eq(users.id, user.id), eq(users.role, 'seller')));
    await recordAudit(tx, { storeId: user.storeId, actorUserId: user.id, action: 'user.password-set', entity: 'user', entityId: user.id });
  });
}
