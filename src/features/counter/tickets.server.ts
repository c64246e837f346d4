import { and, asc, desc, eq, inArray, isNull, sql } from 'drizzle-orm';
import {
  cashDrawers,
  payments,
  rateApprovals,
  sellers,
  stores,
  ticketCounters,
  ticketLines,
  tickets,
  users,
  type TicketState,
} from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import { signInWithPassword, type SessionUser } from '@/features/auth/users.server';
import { currencyExponent, minorPerMajor, type CurrencyCode } from '@/features/pricing/money';
import { decimalToMinor } from './money-input';
import { storeById } from '@/features/stores/stores.server';
import type { PricedLine } from '@/features/pricing/pricing';
import type { Metal } from '@/features/pricing/metals';
import { getStoreSettings } from '@/features/settings/settings.server';
import { enqueueMail } from '@/features/mail/outbox.server';
import { receiptMail } from '@/features/mail/templates';
import { buildReceipt } from '@/features/receipts/receipt';
import type { StoreSettings } from '@/features/settings/settings';
import { AppError } from '@/lib/errors';
import {
  canTransition,
  cashWithinLimit,
  dayInZone,
  holdUntil,
  raiseNeedsApproval,
  sellerProblems,
  staleSpotMetals,
  tagNumber,
  ticketReference,
  TICKET_STATE_LABELS,
  type SellerProblem,
  type TicketAction,
} from './counter';
import type { SaveLinesInput } from './counter.schema';
import { currentSpots } from './spot.server';
import { priceTicket, rateLabel, type PricedTicket } from './ticket-pricing';
import { Dec } from '@/features/pricing/decimal';
import { createPendingReversal, sendReversal } from '@/features/payouts/reversals.server';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

// ---------------------------------------------------------------------------
// Loading and locking
// ---------------------------------------------------------------------------

async function lockTicket(tx: Tx, user: SessionUser, ticketId: string) {
  const [row] = await tx
    .select()
    .from(tickets)
    .where(eq(tickets.id, ticketId))
    .for('update');
  if (!row || (user.role !== 'admin' && row.storeId !== user.storeId)) throw new AppError(404, 'No such ticket');
  return row;
}

function requireTransition(state: TicketState, action: TicketAction): void {
  if (!canTransition(state, action)) {
    throw new AppError(409, `This ticket is ${TICKET_STATE_LABELS[state].toLowerCase()}; it cannot be ${ACTION_PAST[action]} now`);
  }
}

const ACTION_PAST: Record<TicketAction, string> = {
  edit: 'changed',
  quote: 'quoted',
  accept: 'accepted',
  decline: 'declined',
  pay: 'paid',
  void: 'voided',
};

async function storeOf(db: DbOrTx, storeId: string) {
  const s = await storeById(db, storeId);
  if (!s) throw new AppError(404, 'No such store');
  return s;
}

function sellerRules(settings: StoreSettings) {
  return {
    minimumAgeYears: settings['seller.minimum_age_years'],
    expiredIdBlocks: settings['seller.expired_id_blocks'],
    acceptedIdTypes: settings['seller.accepted_id_types'],
  };
}

/** Problems that block buying from the seller today, less a do-not-buy flag a manager has overridden. */
async function blockingSellerProblems(db: DbOrTx, ticket: { sellerId: string; storeId: string; doNotBuyOverrideBy: string | null }, settings: StoreSettings, timeZone: string) {
  const [seller] = await db.select().from(sellers).where(eq(sellers.id, ticket.sellerId));
  if (!seller) throw new AppError(404, 'No such seller');
  const problems = sellerProblems(seller, sellerRules(settings), dayInZone(new Date(), timeZone));
  return problems.filter((p) => !(p.code === 'do-not-buy' && ticket.doNotBuyOverrideBy));
}

function problemsError(problems: SellerProblem[]): AppError {
  return new AppError(
    422,
    problems.map((p) => p.message).join(' '),
    problems.map((p) => ({ path: `seller.${p.code}`, message: p.message })),
  );
}

// ---------------------------------------------------------------------------
// Creating a ticket
// ---------------------------------------------------------------------------

export async function createTicket(
  db: Db,
  actor: SessionUser,
  storeId: string,
  input: { sellerId: string; doNotBuyOverrideReason: string | null },
) {
  const settings = await getStoreSettings(db, storeId);
  return db.transaction(async (tx) => {
    const store = await storeOf(tx, storeId);
    const [seller] = await tx
      .select()
      .from(sellers)
      .where(and(eq(sellers.id, input.sellerId), eq(sellers.storeId, storeId)));
    if (!seller) throw new AppError(404, 'No such seller in this store', [{ path: 'sellerId', message: 'unknown seller' }]);
    const problems = sellerProblems(seller, sellerRules(settings), dayInZone(new Date(), store.timeZone));
    let overrideBy: string | null = null;
    if (problems.some((p) => p.code === 'do-not-buy')) {
      if (actor.role === 'clerk') {
        throw new AppError(403, 'This seller is flagged do not buy: a manager must start the ticket and give a reason', [
          { path: 'seller.do-not-buy', message: seller.doNotBuyReason ?? 'flagged do not buy' },
        ]);
      }
      if (!input.doNotBuyOverrideReason) {
        throw new AppError(422, 'A reason is required to override do not buy', [{ path: 'doNotBuyOverrideReason', message: 'required to override do not buy' }]);
      }
      overrideBy = actor.id;
    }
    const blocking = problems.filter((p) => p.code !== 'do-not-buy');
    if (blocking.length) throw problemsError(blocking);

    const [counter] = await tx
      .insert(ticketCounters)
      .values({ storeId, lastNumber: 1 })
      .onConflictDoUpdate({ target: ticketCounters.storeId, set: { lastNumber: sql`${ticketCounters.lastNumber} + 1` } })
      .returning({ number: ticketCounters.lastNumber });
    const [ticket] = await tx
      .insert(tickets)
      .values({
        storeId,
        number: counter!.number,
        sellerId: seller.id,
        clerkId: actor.id,
        currency: store.currency,
        doNotBuyOverrideBy: overrideBy,
        doNotBuyOverrideReason: overrideBy ? input.doNotBuyOverrideReason : null,
      })
      .returning();
    await recordAudit(tx, {
      storeId,
      actorUserId: actor.id,
      action: 'ticket.create',
      entity: 'ticket',
      entityId: ticket!.id,
      after: { number: ticket!.number, sellerId: seller.id },
    });
    if (overrideBy) {
      await recordAudit(tx, {
        storeId,
        actorUserId: actor.id,
        action: 'seller.do-not-buy-override',
        entity: 'ticket',
        entityId: ticket!.id,
        after: { sellerId: seller.id, reason: input.doNotBuyOverrideReason },
      });
    }
    return { id: ticket!.id, number: ticket!.number, reference: ticketReference(store.code, ticket!.number) };
  });
}

// ---------------------------------------------------------------------------
// Pricing lines on the server
// ---------------------------------------------------------------------------

interface StoredLineInput {
  item: Record<string, unknown>;
  testMethod: string;
  testResult: string | null;
  note: string | null;
  raisePoints: string;
}

function spotValues(spots: Awaited<ReturnType<typeof currentSpots>>): Partial<Record<Metal, string>> {
  const out: Partial<Record<Metal, string>> = {};
  for (const [metal, entry] of Object.entries(spots)) out[metal as Metal] = entry!.pricePerTroyOunce;
  return out;
}

function describe(item: Record<string, unknown>, priced: PricedTicket['lines'][number]): string {
  if (typeof item.description === 'string' && item.description.trim()) return item.description.trim();
  const r = priced.result;
  if (r && r.status === 'priced') {
    if (r.coin) return `${r.coin.count} x ${r.coin.label}`;
    if (r.faceValue) return `${r.faceValue.label}, ${r.faceValue.faceValue} face`;
    const mark = r.mark?.label ?? (typeof item.mark === 'string' ? item.mark : null);
    return [mark, r.metal, String(item.category ?? '')].filter(Boolean).join(' ');
  }
  return [typeof item.mark === 'string' ? item.mark : null, String(item.kind ?? 'item'), String(item.category ?? '')].filter(Boolean).join(' ');
}

/** Writes the priced figures of each line and the ticket's totals. */
async function writePricing(
  tx: Tx,
  ticket: { id: string; storeId: string },
  inputs: StoredLineInput[],
  priced: PricedTicket,
  replaceLines: boolean,
) {
  if (replaceLines) {
    await tx.delete(ticketLines).where(eq(ticketLines.ticketId, ticket.id));
  }
  const rows = inputs.map((input, i) => {
    const p = priced.lines[i]!;
    const r = p.result?.status === 'priced' ? (p.result as PricedLine) : null;
    return {
      ticketId: ticket.id,
      storeId: ticket.storeId,
      position: i + 1,
      input: input as unknown as Record<string, unknown>,
      description: describe(input.item, p).slice(0, 200),
      testMethod: input.testMethod as (typeof ticketLines.$inferInsert)['testMethod'],
      testResult: input.testResult,
      note: input.note,
      raisePoints: input.raisePoints,
      metal: r?.metal ?? null,
      markedFineness: r?.markedFineness ?? null,
      paidOnFineness: r?.paidOnFineness ?? null,
      grossWeightGrams: r?.grossWeightGrams ?? p.result?.grossWeightGrams ?? null,
      netWeightGrams: r?.netWeightGrams ?? p.result?.netWeightGrams ?? null,
      fineWeightGrams: r?.fineWeightGrams ?? null,
      fineWeightTroyOunces: r?.fineWeightTroyOunces ?? null,
      spotPerTroyOunce: r?.spotPerTroyOunce ?? null,
      rateLabel: r ? rateLabel(r) : null,
      meltValueMinor: r?.meltValue.amountMinor ?? 0,
      payoutMinor: r?.payout.amountMinor ?? 0,
      marginMinor: r?.margin.amountMinor ?? 0,
      pricingProblem: p.problem ?? p.raiseError,
    };
  });
  if (replaceLines) {
    if (rows.length) await tx.insert(ticketLines).values(rows);
  } else {
    for (const row of rows) {
      await tx
        .update(ticketLines)
        .set(row)
        .where(and(eq(ticketLines.ticketId, ticket.id), eq(ticketLines.position, row.position)));
    }
  }
  await tx
    .update(tickets)
    .set({ meltValueMinor: priced.meltValueMinor, payoutMinor: priced.payoutMinor, marginMinor: priced.marginMinor })
    .where(eq(tickets.id, ticket.id));
}

function pricingInput(
  settings: StoreSettings,
  currency: string,
  spot: Partial<Record<Metal, string>>,
  ticketRaisePoints: string,
  lines: StoredLineInput[],
) {
  return {
    currency: currency as CurrencyCode,
    spot,
    rates: settings['pricing.rates'],
    assumedFineness: settings['pricing.assumed_fineness'],
    ticketRaisePoints,
    lines: lines.map((l) => ({ item: l.item, raisePoints: l.raisePoints })),
  };
}

/** Replaces a draft's lines with what the clerk graded, priced by the server. A shown offer that is changed goes back to grading. */
export async function saveLines(db: Db, actor: SessionUser, ticketId: string, input: SaveLinesInput) {
  return db.transaction(async (tx) => {
    const ticket = await lockTicket(tx, actor, ticketId);
    requireTransition(ticket.state, 'edit');
    const settings = await getStoreSettings(tx, ticket.storeId);
    const spot = spotValues(await currentSpots(tx, ticket.storeId));
    const stored: StoredLineInput[] = input.lines.map((l) => ({
      item: l.item as unknown as Record<string, unknown>,
      testMethod: l.testMethod,
      testResult: l.testResult,
      note: l.note,
      raisePoints: l.raisePoints,
    }));
    const priced = priceTicket(pricingInput(settings, ticket.currency, spot, input.ticketRaisePoints, stored));
    const issues = priced.lines.flatMap((l, i) => l.inputIssues.map((iss) => ({ path: `lines.${i}.item${iss.path ? '.' + iss.path : ''}`, message: iss.message })));
    if (issues.length) throw new AppError(422, `Invalid input: ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`, issues);

    await writePricing(tx, ticket, stored, priced, true);
    await tx
      .update(tickets)
      .set({ state: 'draft', ticketRaisePoints: input.ticketRaisePoints, quotedAt: null })
      .where(eq(tickets.id, ticket.id));

    let approval: { id: string; state: string } | null = null;
    const limit = settings['rates.clerk_raise_limit_points'];
    if (new Dec(priced.maxRaisePoints).gt(0)) {
      approval = await approvalCovering(tx, ticket.id, priced.maxRaisePoints);
      const managerRaise = actor.role === 'manager' || actor.role === 'admin';
      if (!approval && (managerRaise || raiseNeedsApproval(actor.role, priced.maxRaisePoints, limit))) {
        const [created] = await tx
          .insert(rateApprovals)
          .values({
            storeId: ticket.storeId,
            ticketId: ticket.id,
            requestedBy: actor.id,
            raisePoints: priced.maxRaisePoints,
            state: managerRaise ? 'approved' : 'pending',
            decidedBy: managerRaise ? actor.id : null,
            decidedAt: managerRaise ? new Date() : null,
            note: managerRaise ? 'raised by a manager' : null,
          })
          .returning({ id: rateApprovals.id, state: rateApprovals.state });
        approval = created!;
        await recordAudit(tx, {
          storeId: ticket.storeId,
          actorUserId: actor.id,
          action: managerRaise ? 'rate-approval.self-approve' : 'rate-approval.request',
          entity: 'ticket',
          entityId: ticket.id,
          after: { raisePoints: priced.maxRaisePoints, limitPoints: limit },
        });
      }
    }
    await recordAudit(tx, {
      storeId: ticket.storeId,
      actorUserId: actor.id,
      action: 'ticket.lines-save',
      entity: 'ticket',
      entityId: ticket.id,
      before: { state: ticket.state, payoutMinor: ticket.payoutMinor },
      after: { state: 'draft', lines: stored.length, meltValueMinor: priced.meltValueMinor, payoutMinor: priced.payoutMinor },
    });
    return { meltValueMinor: priced.meltValueMinor, payoutMinor: priced.payoutMinor, marginMinor: priced.marginMinor, approval };
  });
}

/** An approved raise covering at least these points, or a pending request for at least as many. */
async function approvalCovering(tx: DbOrTx, ticketId: string, points: string) {
  const rows = await tx
    .select({ id: rateApprovals.id, state: rateApprovals.state, raisePoints: rateApprovals.raisePoints })
    .from(rateApprovals)
    .where(and(eq(rateApprovals.ticketId, ticketId), inArray(rateApprovals.state, ['approved', 'pending'])))
    .orderBy(desc(rateApprovals.createdAt));
  const covering = rows.filter((r) => new Dec(r.raisePoints).gte(points));
  return covering.find((r) => r.state === 'approved') ?? covering.find((r) => r.state === 'pending') ?? null;
}

/** Re-prices every open ticket of a store on the current spot. Accepted and later tickets are never touched. */
export async function repriceOpenTickets(tx: DbOrTx, storeId: string): Promise<number> {
  const open = await tx
    .select()
    .from(tickets)
    .where(and(eq(tickets.storeId, storeId), inArray(tickets.state, ['draft', 'quoted'])))
    .for('update');
  if (!open.length) return 0;
  const settings = await getStoreSettings(tx, storeId);
  const spot = spotValues(await currentSpots(tx, storeId));
  for (const ticket of open) {
    const lines = await tx.select().from(ticketLines).where(eq(ticketLines.ticketId, ticket.id)).orderBy(asc(ticketLines.position));
    const stored = lines.map((l) => l.input as StoredLineInput);
    const priced = priceTicket(pricingInput(settings, ticket.currency, spot, ticket.ticketRaisePoints, stored));
    await writePricing(tx as Tx, ticket, stored, priced, false);
  }
  return open.length;
}

// ---------------------------------------------------------------------------
// Quote, accept, decline
// ---------------------------------------------------------------------------

async function checkReadyToOffer(tx: Tx, ticket: typeof tickets.$inferSelect, settings: StoreSettings, timeZone: string) {
  const lines = await tx.select().from(ticketLines).where(eq(ticketLines.ticketId, ticket.id));
  if (!lines.length) throw new AppError(422, 'Add at least one line before giving a quote', [{ path: 'lines', message: 'no lines' }]);
  const unpriced = lines.filter((l) => l.pricingProblem);
  if (unpriced.length) {
    throw new AppError(
      422,
      `Some lines cannot be priced: ${unpriced.map((l) => `line ${l.position}: ${l.pricingProblem}`).join('; ')}`,
      unpriced.map((l) => ({ path: `lines.${l.position - 1}`, message: l.pricingProblem! })),
    );
  }
  const spots = await currentSpots(tx, ticket.storeId);
  const stale = staleSpotMetals(
    lines.map((l) => l.metal!).filter(Boolean),
    spots,
    settings['spot.stale_after_minutes'],
    new Date(),
  );
  if (stale.length) {
    throw new AppError(
      409,
      `The ${stale.join(' and ')} spot is older than ${settings['spot.stale_after_minutes']} minutes: enter it again before quoting`,
      stale.map((m) => ({ path: `spot.${m}`, message: 'stale' })),
    );
  }
  const problems = await blockingSellerProblems(tx, ticket, settings, timeZone);
  if (problems.length) throw problemsError(problems);

  const maxRaise = lines.reduce((m, l) => Dec.max(m, new Dec(l.raisePoints).plus(ticket.ticketRaisePoints)), new Dec(0));
  const limit = settings['rates.clerk_raise_limit_points'];
  if (maxRaise.gt(limit)) {
    const approval = await approvalCovering(tx, ticket.id, maxRaise.toFixed());
    if (!approval || approval.state !== 'approved') {
      throw new AppError(409, `A rate raise of ${maxRaise.toFixed()} points is over the clerk limit of ${limit}: a manager must approve it`, [
        { path: 'approval', message: approval ? 'pending' : 'not requested' },
      ]);
    }
  }
  return { lines, spots };
}

export async function quoteTicket(db: Db, actor: SessionUser, ticketId: string) {
  return db.transaction(async (tx) => {
    const ticket = await lockTicket(tx, actor, ticketId);
    requireTransition(ticket.state, 'quote');
    const store = await storeOf(tx, ticket.storeId);
    const settings = await getStoreSettings(tx, ticket.storeId);
    // Price again on the spot in force now, then check it is fresh.
    await repriceOne(tx, ticket, settings);
    await checkReadyToOffer(tx, ticket, settings, store.timeZone);
    await tx.update(tickets).set({ state: 'quoted', quotedAt: new Date() }).where(eq(tickets.id, ticket.id));
    await recordAudit(tx, { storeId: ticket.storeId, actorUserId: actor.id, action: 'ticket.quote', entity: 'ticket', entityId: ticket.id, before: { state: ticket.state }, after: { state: 'quoted' } });
    return getTicket(tx, actor, ticket.id);
  });
}

async function repriceOne(tx: Tx, ticket: typeof tickets.$inferSelect, settings: StoreSettings) {
  const lines = await tx.select().from(ticketLines).where(eq(ticketLines.ticketId, ticket.id)).orderBy(asc(ticketLines.position));
  const stored = lines.map((l) => l.input as StoredLineInput);
  const spot = spotValues(await currentSpots(tx, ticket.storeId));
  const priced = priceTicket(pricingInput(settings, ticket.currency, spot, ticket.ticketRaisePoints, stored));
  await writePricing(tx, ticket, stored, priced, false);
  return priced;
}

export async function acceptTicket(db: Db, actor: SessionUser, ticketId: string, input: { signatureSvg: string }) {
  return db.transaction(async (tx) => {
    const ticket = await lockTicket(tx, actor, ticketId);
    requireTransition(ticket.state, 'accept');
    const store = await storeOf(tx, ticket.storeId);
    const settings = await getStoreSettings(tx, ticket.storeId);
    const priced = await repriceOne(tx, ticket, settings);
    const { spots } = await checkReadyToOffer(tx, ticket, settings, store.timeZone);
    const pricingBasis = {
      spot: Object.fromEntries(
        priced.metalsUsed.map((m) => [m, { spotPriceId: spots[m]!.id, pricePerTroyOunce: spots[m]!.pricePerTroyOunce, enteredAt: spots[m]!.enteredAt }]),
      ),
      rates: settings['pricing.rates'],
      assumedFineness: settings['pricing.assumed_fineness'],
      ticketRaisePoints: ticket.ticketRaisePoints,
      currency: ticket.currency,
    };
    await tx
      .update(tickets)
      .set({
        state: 'accepted',
        acceptedAt: new Date(),
        signatureSvg: input.signatureSvg,
        ownershipStatement: settings['counter.ownership_statement'],
        pricingBasis,
      })
      .where(eq(tickets.id, ticket.id));
    await recordAudit(tx, {
      storeId: ticket.storeId,
      actorUserId: actor.id,
      action: 'ticket.accept',
      entity: 'ticket',
      entityId: ticket.id,
      before: { state: ticket.state },
      after: { state: 'accepted', payoutMinor: priced.payoutMinor, meltValueMinor: priced.meltValueMinor, pricingBasis },
    });
    return getTicket(tx, actor, ticket.id);
  });
}

export async function declineTicket(db: Db, actor: SessionUser, ticketId: string, reason: string | null) {
  return db.transaction(async (tx) => {
    const ticket = await lockTicket(tx, actor, ticketId);
    requireTransition(ticket.state, 'decline');
    await tx.update(tickets).set({ state: 'declined', declinedAt: new Date() }).where(eq(tickets.id, ticket.id));
    await recordAudit(tx, { storeId: ticket.storeId, actorUserId: actor.id, action: 'ticket.decline', entity: 'ticket', entityId: ticket.id, before: { state: ticket.state }, after: { state: 'declined', reason } });
    return getTicket(tx, actor, ticket.id);
  });
}

// ---------------------------------------------------------------------------
// Rate approvals
// ---------------------------------------------------------------------------

export async function pendingApprovals(db: DbOrTx, storeId: string) {
  return db
    .select({
      id: rateApprovals.id,
      ticketId: rateApprovals.ticketId,
      ticketNumber: tickets.number,
      raisePoints: rateApprovals.raisePoints,
      requestedByName: users.name,
      createdAt: rateApprovals.createdAt,
      payoutMinor: tickets.payoutMinor,
      meltValueMinor: tickets.meltValueMinor,
      currency: tickets.currency,
    })
    .from(rateApprovals)
    .innerJoin(tickets, eq(tickets.id, rateApprovals.ticketId))
    .leftJoin(users, eq(users.id, rateApprovals.requestedBy))
    .where(and(eq(rateApprovals.storeId, storeId), eq(rateApprovals.state, 'pending')))
    .orderBy(asc(rateApprovals.createdAt));
}

/**
 * A manager decides a raise: signed in as themself, or on the clerk's screen with their own
 * e-mail and password (checked and throttled like any sign-in).
 */
export async function decideApproval(
  db: Db,
  actor: SessionUser,
  approvalId: string,
  input: { decision: 'approved' | 'rejected'; note: string | null; managerEmail?: string; managerPassword?: string },
  clientAddress: string,
) {
  let decider = actor;
  if (actor.role === 'clerk' || actor.role === 'seller') {
    if (!input.managerEmail || !input.managerPassword) {
      throw new AppError(403, 'A manager must approve: sign in as a manager or enter a manager\u2019s e-mail and password', [
        { path: 'managerEmail', message: 'a manager must approve' },
      ]);
    }
    const result = await signInWithPassword(db, input.managerEmail, input.managerPassword, clientAddress);
    if (result.status === 'throttled') throw new AppError(429, 'Too many failed sign-ins. Wait and try again.');
    if (result.status !== 'ok' || (result.user.role !== 'manager' && result.user.role !== 'admin')) {
      throw new AppError(403, 'Those are not the credentials of an active manager', [{ path: 'managerEmail', message: 'not a manager' }]);
    }
    decider = result.user;
  }
  return db.transaction(async (tx) => {
    const [approval] = await tx.select().from(rateApprovals).where(eq(rateApprovals.id, approvalId)).for('update');
    if (!approval || (decider.role !== 'admin' && approval.storeId !== decider.storeId) || (actor.role !== 'admin' && approval.storeId !== actor.storeId)) {
      throw new AppError(404, 'No such approval request');
    }
    if (approval.state !== 'pending') throw new AppError(409, `This request was already ${approval.state}`);
    await tx
      .update(rateApprovals)
      .set({ state: input.decision, decidedBy: decider.id, decidedAt: new Date(), note: input.note })
      .where(eq(rateApprovals.id, approvalId));
    await recordAudit(tx, {
      storeId: approval.storeId,
      actorUserId: decider.id,
      action: `rate-approval.${input.decision === 'approved' ? 'approve' : 'reject'}`,
      entity: 'ticket',
      entityId: approval.ticketId,
      before: { state: 'pending', raisePoints: approval.raisePoints },
      after: { state: input.decision, note: input.note, onScreenOf: decider.id === actor.id ? null : actor.id },
    });
    return { id: approvalId, state: input.decision, decidedBy: decider.name };
  });
}

// ---------------------------------------------------------------------------
// Paying, voiding
// ---------------------------------------------------------------------------

export async function openDrawerFor(db: DbOrTx, clerkId: string) {
  const [d] = await db
    .select()
    .from(cashDrawers)
    .where(and(eq(cashDrawers.clerkId, clerkId), isNull(cashDrawers.closedAt)));
  return d ?? null;
}

export async function payTicket(
  db: Db,
  actor: SessionUser,
  ticketId: string,
  input: { method: 'cash' } | { method: 'check'; checkNumber: string } | { method: 'electronic' },
) {
  if (input.method === 'electronic') {
    throw new AppError(422, 'Electronic payouts go through the settlement service', [{ path: 'method', message: 'use the electronic payout' }]);
  }
  return db.transaction(async (tx) => {
    const ticket = await lockTicket(tx, actor, ticketId);
    requireTransition(ticket.state, 'pay');
    await requireNoLivePayout(tx, ticket.id);
    const settings = await getStoreSettings(tx, ticket.storeId);
    let drawerId: string | null = null;
    if (input.method === 'cash') {
      const limit = settings['cash.limit_per_ticket'];
      const perMajor = minorPerMajor(ticket.currency as CurrencyCode).toNumber();
      if (!cashWithinLimit(ticket.payoutMinor, limit, perMajor)) {
        throw new AppError(422, `Cash is refused: the payout is over this store's cash limit of ${limit} ${ticket.currency} per ticket. Pay by check or electronically.`, [
          { path: 'method', message: `over the cash limit of ${limit}` },
        ]);
      }
      const drawer = await openDrawerFor(tx, actor.id);
      if (!drawer || drawer.storeId !== ticket.storeId) {
        throw new AppError(409, 'Open your cash drawer before paying cash', [{ path: 'drawer', message: 'no open drawer' }]);
      }
      const balance = await drawerExpectedMinor(tx, drawer.id, drawer.floatMinor);
      if (balance < ticket.payoutMinor) {
        throw new AppError(409, 'Your drawer does not hold enough cash for this payout', [{ path: 'drawer', message: 'not enough cash' }]);
      }
      drawerId = drawer.id;
    }
    const [payment] = await tx
      .insert(payments)
      .values({
        storeId: ticket.storeId,
        ticketId: ticket.id,
        kind: 'payout',
        method: input.method,
        state: 'completed',
        amountMinor: ticket.payoutMinor,
        currency: ticket.currency,
        drawerId,
        checkNumber: input.method === 'check' ? input.checkNumber : null,
        createdBy: actor.id,
      })
      .returning({ id: payments.id });
    await markPaid(tx, ticket, actor.id, { method: input.method, paymentId: payment!.id, drawerId });
    return getTicket(tx, actor, ticket.id);
  });
}

/** An electronic payout in flight keeps the ticket from being paid another way until it fails. */
export async function requireNoLivePayout(tx: DbOrTx, ticketId: string): Promise<void> {
  const [live] = await tx
    .select({ id: payments.id, state: payments.state })
    .from(payments)
    .where(and(eq(payments.ticketId, ticketId), eq(payments.kind, 'payout'), inArray(payments.state, ['pending', 'completed'])));
  if (live) throw new AppError(409, live.state === 'pending' ? 'An electronic payout for this ticket is in progress' : 'This ticket is already paid');
}

/**
 * A ticket whose payout has gone through: each line gets its tag and release date from the store's
 * hold period, the ticket is paid, and the seller's receipt e-mail is queued, all in the caller's
 * transaction. Used for cash and check at the counter and for an electronic payout the provider confirms.
 */
export async function markPaid(
  tx: Tx,
  ticket: typeof tickets.$inferSelect,
  actorUserId: string | null,
  payment: { method: string; paymentId: string; drawerId?: string | null },
): Promise<void> {
  const store = await storeOf(tx, ticket.storeId);
  const settings = await getStoreSettings(tx, ticket.storeId);
  const paidAt = new Date();
  const release = holdUntil(paidAt, settings['hold.period_days'], store.timeZone);
  const lines = await tx.select({ id: ticketLines.id, position: ticketLines.position }).from(ticketLines).where(eq(ticketLines.ticketId, ticket.id));
  for (const line of lines) {
    await tx
      .update(ticketLines)
      .set({ tagNumber: tagNumber(store.code, ticket.number, line.position), holdUntil: release })
      .where(eq(ticketLines.id, line.id));
  }
  await tx.update(tickets).set({ state: 'paid', paidAt, holdUntil: release }).where(eq(tickets.id, ticket.id));
  await recordAudit(tx, {
    storeId: ticket.storeId,
    actorUserId,
    action: 'ticket.pay',
    entity: 'ticket',
    entityId: ticket.id,
    before: { state: ticket.state },
    after: { state: 'paid', method: payment.method, amountMinor: ticket.payoutMinor, paymentId: payment.paymentId, drawerId: payment.drawerId ?? null, holdUntil: release },
  });
  await queueReceiptMail(tx, ticket.id);
}

/** Queues the seller's receipt e-mail (with the PDF attached at send time) when the seller gave an address. */
export async function queueReceiptMail(tx: DbOrTx, ticketId: string): Promise<void> {
  const view = await getTicketUnscoped(tx, ticketId);
  if (!view.seller.email) return;
  const content = receiptMail(buildReceipt(view));
  await enqueueMail(tx, { storeId: view.storeId, kind: 'receipt', to: view.seller.email, ...content, attachTicketReceiptId: view.id });
}

/**
 * A manager voids a ticket. Refused (409, naming the payout) while an electronic payout is pending:
 * the money may be on its way. Cash and check payouts of a paid ticket are reversed at once (the
 * money is handed back at the counter); an electronic payout gets a pending reversal that only the
 * provider's confirmation or a manager's record of the recovery completes.
 */
export async function voidTicket(db: Db, actor: SessionUser, ticketId: string, reason: string) {
  if (actor.role !== 'manager' && actor.role !== 'admin') throw new AppError(403, 'Only a manager may void a ticket');
  const { view, toSend } = await db.transaction(async (tx) => {
    const ticket = await lockTicket(tx, actor, ticketId);
    requireTransition(ticket.state, 'void');
    const [live] = await tx
      .select()
      .from(payments)
      .where(and(eq(payments.ticketId, ticket.id), eq(payments.kind, 'payout'), eq(payments.state, 'pending')));
    if (live) {
      const label = `payout ${live.id}${live.providerPayoutId ? ` (provider payout ${live.providerPayoutId})` : ''}`;
      throw new AppError(409, `An electronic ${label} is pending for this ticket: it cannot be voided until the provider confirms or fails it`, [
        { path: 'payment', message: live.id },
      ]);
    }
    const reversals: string[] = [];
    const toSend: string[] = [];
    if (ticket.state === 'paid') {
      const paid = await tx
        .select()
        .from(payments)
        .where(and(eq(payments.ticketId, ticket.id), eq(payments.kind, 'payout'), eq(payments.state, 'completed')));
      for (const p of paid) {
        if (p.method === 'electronic') {
          const pending = await createPendingReversal(tx, p, actor.id, { sendNow: true });
          reversals.push(pending.id);
          toSend.push(pending.id);
          continue;
        }
        const [rev] = await tx
          .insert(payments)
          .values({
            storeId: p.storeId,
            ticketId: p.ticketId,
            kind: 'reversal',
            reversesPaymentId: p.id,
            method: p.method,
            state: 'completed',
            amountMinor: p.amountMinor,
            currency: p.currency,
            drawerId: p.drawerId,
            checkNumber: p.checkNumber,
            createdBy: actor.id,
          })
          .returning({ id: payments.id });
        reversals.push(rev!.id);
      }
    }
    await tx.update(tickets).set({ state: 'voided', voidedAt: new Date(), voidedBy: actor.id, voidReason: reason }).where(eq(tickets.id, ticket.id));
    await recordAudit(tx, {
      storeId: ticket.storeId,
      actorUserId: actor.id,
      action: 'ticket.void',
      entity: 'ticket',
      entityId: ticket.id,
      before: { state: ticket.state },
      after: { state: 'voided', reason, reversals, pendingReversals: toSend },
    });
    return { view: await getTicket(tx, actor, ticket.id), toSend };
  });
  if (!toSend.length) return view;
  // Asked after the commit; a reversal the provider does not confirm now stays pending for the worker.
  for (const id of toSend) await sendReversal(db, id).catch(() => null);
  return getTicket(db, actor, ticketId);
}

// ---------------------------------------------------------------------------
// Cash drawers
// ---------------------------------------------------------------------------

/** Float, less cash paid out, plus cash reversals that came back. */
export async function drawerExpectedMinor(db: DbOrTx, drawerId: string, floatMinor: number): Promise<number> {
  const [row] = await db
    .select({
      paidOut: sql<string>`coalesce(sum(${payments.amountMinor}) filter (where ${payments.kind} = 'payout' and ${payments.state} = 'completed'), 0)`,
      returned: sql<string>`coalesce(sum(${payments.amountMinor}) filter (where ${payments.kind} = 'reversal' and ${payments.state} = 'completed'), 0)`,
    })
    .from(payments)
    .where(and(eq(payments.drawerId, drawerId), eq(payments.method, 'cash')));
  return floatMinor - Number(row?.paidOut ?? 0) + Number(row?.returned ?? 0);
}

export async function openDrawer(db: Db, actor: SessionUser, storeId: string, floatDecimal: string) {
  return db.transaction(async (tx) => {
    const store = await storeOf(tx, storeId);
    const floatMinor = decimalToMinor(floatDecimal, currencyExponent(store.currency as CurrencyCode));
    if (await openDrawerFor(tx, actor.id)) throw new AppError(409, 'You already have an open drawer');
    const [drawer] = await tx
      .insert(cashDrawers)
      .values({ storeId, clerkId: actor.id, currency: store.currency, floatMinor })
      .returning();
    await recordAudit(tx, { storeId, actorUserId: actor.id, action: 'drawer.open', entity: 'cash_drawer', entityId: drawer!.id, after: { floatMinor } });
    return drawer!;
  });
}

/** A manager counts and closes a drawer; the difference between count and expected is recorded. */
export async function closeDrawer(db: Db, actor: SessionUser, drawerId: string, countedDecimal: string) {
  if (actor.role !== 'manager' && actor.role !== 'admin') throw new AppError(403, 'Only a manager closes a cash drawer');
  return db.transaction(async (tx) => {
    const [drawer] = await tx.select().from(cashDrawers).where(eq(cashDrawers.id, drawerId)).for('update');
    if (!drawer || (actor.role !== 'admin' && drawer.storeId !== actor.storeId)) throw new AppError(404, 'No such drawer');
    if (drawer.closedAt) throw new AppError(409, 'This drawer is already closed');
    const countedMinor = decimalToMinor(countedDecimal, currencyExponent(drawer.currency as CurrencyCode));
    const expectedMinor = await drawerExpectedMinor(tx, drawer.id, drawer.floatMinor);
    await tx
      .update(cashDrawers)
      .set({ closedAt: new Date(), closedBy: actor.id, countedMinor, expectedMinor })
      .where(eq(cashDrawers.id, drawer.id));
    await recordAudit(tx, {
      storeId: drawer.storeId,
      actorUserId: actor.id,
      action: 'drawer.close',
      entity: 'cash_drawer',
      entityId: drawer.id,
      after: { expectedMinor, countedMinor, differenceMinor: countedMinor - expectedMinor },
    });
    return { expectedMinor, countedMinor, differenceMinor: countedMinor - expectedMinor };
  });
}

export async function drawersOfStore(db: DbOrTx, storeId: string) {
  const rows = await db
    .select({
      id: cashDrawers.id,
      clerkName: users.name,
      clerkId: cashDrawers.clerkId,
      currency: cashDrawers.currency,
      floatMinor: cashDrawers.floatMinor,
      openedAt: cashDrawers.openedAt,
      closedAt: cashDrawers.closedAt,
      countedMinor: cashDrawers.countedMinor,
      expectedMinor: cashDrawers.expectedMinor,
    })
    .from(cashDrawers)
    .leftJoin(users, eq(users.id, cashDrawers.clerkId))
    .where(eq(cashDrawers.storeId, storeId))
    .orderBy(desc(cashDrawers.openedAt))
    .limit(30);
  return Promise.all(rows.map(async (r) => ({ ...r, balanceMinor: r.closedAt ? r.expectedMinor! : await drawerExpectedMinor(db, r.id, r.floatMinor) })));
}

// ---------------------------------------------------------------------------
// Reading tickets
// ---------------------------------------------------------------------------

/** A ticket for the system's own work (webhooks, mail), not on behalf of a signed-in user. */
export function getTicketUnscoped(db: DbOrTx, ticketId: string) {
  return getTicket(db, SYSTEM_READER, ticketId);
}
const SYSTEM_READER: SessionUser = { id: 'system', name: 'Cupel', email: 'system@cupel.invalid', role: 'admin', storeId: null, storeName: null };

export async function getTicket(db: DbOrTx, user: SessionUser, ticketId: string) {
  const [row] = await db
    .select({
      ticket: tickets,
      storeCode: stores.code,
      storeName: stores.name,
      storeAddress: sql<string>`${stores.addressLine1} || ', ' || ${stores.city} || ', ' || ${stores.region} || ' ' || ${stores.postalCode}`,
      storePhone: stores.phone,
      storeTimeZone: stores.timeZone,
      clerkName: users.name,
    })
    .from(tickets)
    .innerJoin(stores, eq(stores.id, tickets.storeId))
    .leftJoin(users, eq(users.id, tickets.clerkId))
    .where(eq(tickets.id, ticketId));
  if (!row || (user.role !== 'admin' && row.ticket.storeId !== user.storeId)) throw new AppError(404, 'No such ticket');
  const [seller] = await db.select().from(sellers).where(eq(sellers.id, row.ticket.sellerId));
  const lines = await db.select().from(ticketLines).where(eq(ticketLines.ticketId, ticketId)).orderBy(asc(ticketLines.position));
  const ticketPayments = await db.select().from(payments).where(eq(payments.ticketId, ticketId)).orderBy(asc(payments.createdAt));
  const approvals = await db
    .select({ id: rateApprovals.id, state: rateApprovals.state, raisePoints: rateApprovals.raisePoints, decidedAt: rateApprovals.decidedAt, note: rateApprovals.note })
    .from(rateApprovals)
    .where(eq(rateApprovals.ticketId, ticketId))
    .orderBy(desc(rateApprovals.createdAt));
  const t = row.ticket;
  return {
    ...t,
    reference: ticketReference(row.storeCode, t.number),
    stateLabel: TICKET_STATE_LABELS[t.state],
    store: { code: row.storeCode, name: row.storeName, address: row.storeAddress, phone: row.storePhone, timeZone: row.storeTimeZone },
    clerkName: row.clerkName,
    seller: seller!,
    lines,
    payments: ticketPayments,
    approvals,
  };
}
export type TicketView = Awaited<ReturnType<typeof getTicket>>;

export async function listTickets(db: DbOrTx, storeId: string, options: { sellerId?: string; limit?: number } = {}) {
  return db
    .select({
      id: tickets.id,
      number: tickets.number,
      state: tickets.state,
      payoutMinor: tickets.payoutMinor,
      meltValueMinor: tickets.meltValueMinor,
      currency: tickets.currency,
      createdAt: tickets.createdAt,
      sellerName: sellers.legalName,
      storeCode: stores.code,
    })
    .from(tickets)
    .innerJoin(sellers, eq(sellers.id, tickets.sellerId))
    .innerJoin(stores, eq(stores.id, tickets.storeId))
    .where(and(eq(tickets.storeId, storeId), options.sellerId ? eq(tickets.sellerId, options.sellerId) : undefined))
    .orderBy(desc(tickets.createdAt))
    .limit(options.limit ?? 50);
}
