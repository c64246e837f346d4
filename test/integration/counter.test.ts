import { describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { auditLog, payments, rateApprovals, sellers, ticketLines, tickets } from '@/db/schema';
import { saveLinesSchema } from '@/features/counter/counter.schema';
import {
  acceptTicket,
  closeDrawer,
  createTicket,
  declineTicket,
  decideApproval,
  getTicket,
  openDrawer,
  payTicket,
  quoteTicket,
  saveLines,
  voidTicket,
} from '@/features/counter/tickets.server';
import { priceQuote } from '@/features/pricing/pricing';
import { FACTORY_PASSWORD, makeSeller, testDb, unique } from '../support/db';
import { FLOW_LINES, SIGNATURE, makeCounterWorld, setOldSpot, setSetting, setSpots, type CounterWorld } from '../support/counter';

const db = testDb();

async function draftWithLines(world: CounterWorld, lines: unknown[] = [...FLOW_LINES], ticketRaisePoints = '0') {
  const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });
  await saveLines(db, world.clerk, t.id, saveLinesSchema.parse({ lines, ticketRaisePoints }));
  return t;
}

async function paidReady(world: CounterWorld) {
  const t = await draftWithLines(world);
  await quoteTicket(db, world.clerk, t.id);
  await acceptTicket(db, world.clerk, t.id, { signatureSvg: SIGNATURE });
  return t;
}

async function auditActions(entityId: string) {
  return (await db.select({ action: auditLog.action }).from(auditLog).where(eq(auditLog.entityId, entityId))).map((r) => r.action);
}

describe('the counter flow', () => {
  it('numbers tickets sequentially per store', async () => {
    const a = await makeCounterWorld(db);
    const b = await makeCounterWorld(db);
    const n1 = await createTicket(db, a.clerk, a.storeId, { sellerId: a.sellerId, doNotBuyOverrideReason: null });
    const n2 = await createTicket(db, a.clerk, a.storeId, { sellerId: a.sellerId, doNotBuyOverrideReason: null });
    const m1 = await createTicket(db, b.clerk, b.storeId, { sellerId: b.sellerId, doNotBuyOverrideReason: null });
    expect([n1.number, n2.number, m1.number]).toEqual([1, 2, 1]);
    expect(n2.reference).toBe(`${a.storeCode}-000002`);
  });

  it('prices on the server exactly as the engine does, and the ticket total is the sum of its lines', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await draftWithLines(world);
    const view = await getTicket(db, world.clerk, t.id);
    const engine = priceQuote({ currency: 'USD', spot: { gold: '2400.00', silver: '30.00' }, lines: FLOW_LINES.map((l) => l.item) });
    expect(view.payoutMinor).toBe(engine.totals.payout.amountMinor);
    expect(view.meltValueMinor).toBe(engine.totals.meltValue.amountMinor);
    expect(view.lines.map((l) => l.payoutMinor)).toEqual(engine.lines.map((l) => (l.status === 'priced' ? l.payout.amountMinor : 0)));
    expect(view.lines.reduce((s, l) => s + l.payoutMinor, 0)).toBe(view.payoutMinor);
    expect(view.marginMinor).toBe(view.meltValueMinor - view.payoutMinor);
    expect(view.lines[0]).toMatchObject({ metal: 'silver', testMethod: 'acid', description: 'Sterling flatware, 6 pieces', netWeightGrams: '316.6000' });
  });

  it('keeps a line it cannot price yet with its reason, and will not quote until it can', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { silver: '30.00' });
    const t = await draftWithLines(world);
    const view = await getTicket(db, world.clerk, t.id);
    expect(view.lines[1]!.pricingProblem).toMatch(/gold spot/);
    await expect(quoteTicket(db, world.clerk, t.id)).rejects.toMatchObject({ status: 422, issues: [{ path: 'lines.1' }] });
  });

  it('refuses a line with bad input with 422 naming the field, and leaves the saved lines as they were', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await draftWithLines(world);
    const before = await getTicket(db, world.clerk, t.id);
    const bad = saveLinesSchema.parse({
      lines: [FLOW_LINES[0], { item: { kind: 'weight', mark: '14K', grossWeight: { value: '2', unit: 'g' }, deductions: [{ kind: 'grams', value: '3' }] } }],
    });
    await expect(saveLines(db, world.clerk, t.id, bad)).rejects.toMatchObject({ status: 422, issues: [expect.objectContaining({ path: expect.stringMatching(/^lines\.1\.item/) })] });
    const after = await getTicket(db, world.clerk, t.id);
    expect(after.lines.map((l) => l.id)).toEqual(before.lines.map((l) => l.id));
    expect(after.payoutMinor).toBe(before.payoutMinor);
    expect((await auditActions(t.id)).filter((a) => a === 'ticket.lines-save')).toHaveLength(1);
  });

  it('refuses a quote on a stale spot until someone enters it again', async () => {
    const world = await makeCounterWorld(db);
    await setOldSpot(db, world, 'gold', '2400.00', 31);
    await setOldSpot(db, world, 'silver', '30.00', 5);
    const t = await draftWithLines(world);
    await expect(quoteTicket(db, world.clerk, t.id)).rejects.toMatchObject({ status: 409, issues: [{ path: 'spot.gold' }] });
    await setSpots(db, world, { gold: '2410.00' });
    const quoted = await quoteTicket(db, world.clerk, t.id);
    expect(quoted.state).toBe('quoted');
  });

  it('honours the store\u2019s stale-after setting', async () => {
    const world = await makeCounterWorld(db);
    await setSetting(db, world, 'spot.stale_after_minutes', 60);
    await setOldSpot(db, world, 'gold', '2400.00', 45);
    await setOldSpot(db, world, 'silver', '30.00', 45);
    const t = await draftWithLines(world);
    expect((await quoteTicket(db, world.clerk, t.id)).state).toBe('quoted');
  });

  it('re-prices open quotes on a new spot, and never an accepted one', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const open = await draftWithLines(world);
    await quoteTicket(db, world.clerk, open.id);
    const accepted = await paidReady(world);
    const openBefore = (await getTicket(db, world.clerk, open.id)).payoutMinor;
    const acceptedBefore = await getTicket(db, world.clerk, accepted.id);
    await setSpots(db, world, { silver: '33.00' });
    const openAfter = await getTicket(db, world.clerk, open.id);
    const acceptedAfter = await getTicket(db, world.clerk, accepted.id);
    expect(openAfter.payoutMinor).toBeGreaterThan(openBefore);
    expect(openAfter.state).toBe('quoted');
    expect(acceptedAfter.payoutMinor).toBe(acceptedBefore.payoutMinor);
    expect(acceptedAfter.lines.map((l) => l.spotPerTroyOunce)).toEqual(acceptedBefore.lines.map((l) => l.spotPerTroyOunce));
    expect((acceptedAfter.pricingBasis as { spot: { silver: { pricePerTroyOunce: string } } }).spot.silver.pricePerTroyOunce).toBe('30.0000');
  });

  it('walks draft, quoted, accepted, paid, with every step in the audit log, tags and release dates', async () => {
    const world = await makeCounterWorld(db);
    await setSetting(db, world, 'hold.period_days', 14);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await paidReady(world);
    await openDrawer(db, world.clerk, world.storeId, '5000.00');
    const paid = await payTicket(db, world.clerk, t.id, { method: 'cash' });
    expect(paid.state).toBe('paid');
    expect(paid.lines.map((l) => l.tagNumber)).toEqual([1, 2, 3].map((p) => `${world.storeCode}-${String(t.number).padStart(6, '0')}-0${p}`));
    const expectedRelease = new Date(Date.now() + 14 * 86_400_000).toISOString().slice(0, 10);
    // The store's calendar day may differ from UTC's by one near midnight.
    expect([expectedRelease, new Date(Date.now() + 13 * 86_400_000).toISOString().slice(0, 10)]).toContain(paid.holdUntil);
    expect(paid.lines.every((l) => l.holdUntil === paid.holdUntil)).toBe(true);
    expect(await auditActions(t.id)).toEqual(['ticket.create', 'ticket.lines-save', 'ticket.quote', 'ticket.accept', 'ticket.pay']);
  });

  it('enforces the order of states with 409', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await draftWithLines(world);
    await expect(acceptTicket(db, world.clerk, t.id, { signatureSvg: SIGNATURE })).rejects.toMatchObject({ status: 409 });
    await expect(payTicket(db, world.clerk, t.id, { method: 'check', checkNumber: '100' })).rejects.toMatchObject({ status: 409 });
    await quoteTicket(db, world.clerk, t.id);
    await expect(quoteTicket(db, world.clerk, t.id)).rejects.toMatchObject({ status: 409 });
    await declineTicket(db, world.clerk, t.id, 'wants to think about it');
    await expect(acceptTicket(db, world.clerk, t.id, { signatureSvg: SIGNATURE })).rejects.toMatchObject({ status: 409 });
    await expect(saveLines(db, world.clerk, t.id, saveLinesSchema.parse({ lines: [] }))).rejects.toMatchObject({ status: 409 });
    const kept = await getTicket(db, world.clerk, t.id);
    expect(kept.state).toBe('declined');
    expect(kept.lines).toHaveLength(3);
  });

  it('another store\u2019s clerk sees no ticket (404)', async () => {
    const world = await makeCounterWorld(db);
    const other = await makeCounterWorld(db);
    const t = await createTicket(db, world.clerk, world.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null });
    await expect(getTicket(db, other.clerk, t.id)).rejects.toMatchObject({ status: 404 });
    await expect(createTicket(db, other.clerk, other.storeId, { sellerId: world.sellerId, doNotBuyOverrideReason: null })).rejects.toMatchObject({ status: 404 });
  });
});

describe('seller rules', () => {
  it('refuses an expired ID when the store says so, and allows it when the setting is off', async () => {
    const world = await makeCounterWorld(db);
    const expired = await makeSeller(db, world.storeId, { idExpiry: '2020-01-31' });
    await expect(createTicket(db, world.clerk, world.storeId, { sellerId: expired.id, doNotBuyOverrideReason: null })).rejects.toMatchObject({
      status: 422,
      issues: [{ path: 'seller.id-expired' }],
    });
    await setSetting(db, world, 'seller.expired_id_blocks', false);
    const t = await createTicket(db, world.clerk, world.storeId, { sellerId: expired.id, doNotBuyOverrideReason: null });
    expect(t.number).toBeGreaterThan(0);
  });

  it('refuses a seller under the store\u2019s minimum age', async () => {
    const world = await makeCounterWorld(db);
    const young = new Date();
    young.setUTCFullYear(young.getUTCFullYear() - 17);
    const minor = await makeSeller(db, world.storeId, { dateOfBirth: young.toISOString().slice(0, 10) });
    await expect(createTicket(db, world.clerk, world.storeId, { sellerId: minor.id, doNotBuyOverrideReason: null })).rejects.toMatchObject({
      status: 422,
      issues: [{ path: 'seller.under-age' }],
    });
  });

  it('refuses an ID type the store does not accept', async () => {
    const world = await makeCounterWorld(db);
    const s = await makeSeller(db, world.storeId, { idType: 'national-id' });
    await expect(createTicket(db, world.clerk, world.storeId, { sellerId: s.id, doNotBuyOverrideReason: null })).rejects.toMatchObject({
      issues: [{ path: 'seller.id-type-not-accepted' }],
    });
  });

  it('blocks a do-not-buy seller unless a manager overrides with a reason, and records the override', async () => {
    const world = await makeCounterWorld(db);
    const flagged = await makeSeller(db, world.storeId, { doNotBuy: true, doNotBuyReason: 'police hold notice 2026-114' });
    await expect(createTicket(db, world.clerk, world.storeId, { sellerId: flagged.id, doNotBuyOverrideReason: 'cleared' })).rejects.toMatchObject({ status: 403 });
    await expect(createTicket(db, world.manager, world.storeId, { sellerId: flagged.id, doNotBuyOverrideReason: null })).rejects.toMatchObject({
      status: 422,
      issues: [{ path: 'doNotBuyOverrideReason' }],
    });
    const t = await createTicket(db, world.manager, world.storeId, { sellerId: flagged.id, doNotBuyOverrideReason: 'hold released by letter, copy on file' });
    const [row] = await db.select().from(tickets).where(eq(tickets.id, t.id));
    expect(row).toMatchObject({ doNotBuyOverrideBy: world.manager.id, doNotBuyOverrideReason: 'hold released by letter, copy on file' });
    expect(await auditActions(t.id)).toContain('seller.do-not-buy-override');
    expect(await db.select().from(tickets).where(and(eq(tickets.sellerId, flagged.id)))).toHaveLength(1);
    const [s] = await db.select().from(sellers).where(eq(sellers.id, flagged.id));
    expect(s!.doNotBuy).toBe(true);
  });
});

describe('rate raises and approvals', () => {
  it('lets a clerk raise up to the store limit without approval', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const plain = await draftWithLines(world);
    const raised = await draftWithLines(world, [...FLOW_LINES], '3');
    const a = await getTicket(db, world.clerk, plain.id);
    const b = await getTicket(db, world.clerk, raised.id);
    expect(b.payoutMinor).toBeGreaterThan(a.payoutMinor);
    expect(b.lines[1]!.rateLabel).toBe('83% of melt');
    expect((await quoteTicket(db, world.clerk, raised.id)).state).toBe('quoted');
  });

  it('needs a manager beyond the limit: pending blocks the quote, approval with the manager\u2019s own credentials lets it through', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const lines = [{ ...FLOW_LINES[1], raisePoints: '5' }];
    const t = await draftWithLines(world, lines);
    const [approval] = await db.select().from(rateApprovals).where(eq(rateApprovals.ticketId, t.id));
    expect(approval).toMatchObject({ state: 'pending', raisePoints: '5.00', requestedBy: world.clerk.id });
    await expect(quoteTicket(db, world.clerk, t.id)).rejects.toMatchObject({ status: 409, issues: [{ path: 'approval', message: 'pending' }] });
    await expect(decideApproval(db, world.clerk, approval!.id, { decision: 'approved', note: null }, unique('addr'))).rejects.toMatchObject({ status: 403 });
    await expect(
      decideApproval(db, world.clerk, approval!.id, { decision: 'approved', note: null, managerEmail: world.clerk.email, managerPassword: FACTORY_PASSWORD }, unique('addr')),
    ).rejects.toMatchObject({ status: 403 });
    const decided = await decideApproval(
      db,
      world.clerk,
      approval!.id,
      { decision: 'approved', note: 'long-standing seller', managerEmail: world.manager.email, managerPassword: FACTORY_PASSWORD },
      unique('addr'),
    );
    expect(decided.state).toBe('approved');
    expect((await quoteTicket(db, world.clerk, t.id)).state).toBe('quoted');
    const [audit] = await db.select().from(auditLog).where(and(eq(auditLog.entityId, t.id), eq(auditLog.action, 'rate-approval.approve')));
    expect(audit!.actorUserId).toBe(world.manager.id);
    expect(await auditActions(t.id)).toContain('rate-approval.request');
  });

  it('a rejected raise keeps the ticket from being quoted until the raise is lowered', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await draftWithLines(world, [{ ...FLOW_LINES[1], raisePoints: '6' }]);
    const [approval] = await db.select().from(rateApprovals).where(eq(rateApprovals.ticketId, t.id));
    await decideApproval(db, world.manager, approval!.id, { decision: 'rejected', note: 'too high' }, unique('addr'));
    await expect(quoteTicket(db, world.clerk, t.id)).rejects.toMatchObject({ status: 409 });
    await expect(decideApproval(db, world.manager, approval!.id, { decision: 'approved', note: null }, unique('addr'))).rejects.toMatchObject({ status: 409 });
    await saveLines(db, world.clerk, t.id, saveLinesSchema.parse({ lines: [{ ...FLOW_LINES[1], raisePoints: '2' }] }));
    expect((await quoteTicket(db, world.clerk, t.id)).state).toBe('quoted');
  });
});

describe('paying', () => {
  it('refuses cash above the store\u2019s limit with the reason, and takes a check', async () => {
    const world = await makeCounterWorld(db);
    await setSetting(db, world, 'cash.limit_per_ticket', '50.00');
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await paidReady(world);
    await openDrawer(db, world.clerk, world.storeId, '5000.00');
    await expect(payTicket(db, world.clerk, t.id, { method: 'cash' })).rejects.toMatchObject({ status: 422, message: expect.stringContaining('cash limit of 50.00') });
    expect(await db.select().from(payments).where(eq(payments.ticketId, t.id))).toHaveLength(0);
    const paid = await payTicket(db, world.clerk, t.id, { method: 'check', checkNumber: '004512' });
    expect(paid.payments).toMatchObject([{ method: 'check', checkNumber: '004512', amountMinor: paid.payoutMinor, state: 'completed' }]);
  });

  it('needs an open drawer for cash, tracks its balance, and closes with a counted difference', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await paidReady(world);
    await expect(payTicket(db, world.clerk, t.id, { method: 'cash' })).rejects.toMatchObject({ status: 409, issues: [{ path: 'drawer' }] });
    const drawer = await openDrawer(db, world.clerk, world.storeId, '2000.00');
    await expect(openDrawer(db, world.clerk, world.storeId, '100.00')).rejects.toMatchObject({ status: 409 });
    const paid = await payTicket(db, world.clerk, t.id, { method: 'cash' });
    await expect(closeDrawer(db, world.clerk, drawer.id, '0')).rejects.toMatchObject({ status: 403 });
    const closed = await closeDrawer(db, world.manager, drawer.id, '1000.00');
    expect(closed.expectedMinor).toBe(200_000 - paid.payoutMinor);
    expect(closed.differenceMinor).toBe(100_000 - closed.expectedMinor);
  });

  it('pays a ticket once: a second payment is refused and the database allows only one live payout', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await paidReady(world);
    const results = await Promise.allSettled([
      payTicket(db, world.clerk, t.id, { method: 'check', checkNumber: '1' }),
      payTicket(db, world.clerk, t.id, { method: 'check', checkNumber: '2' }),
    ]);
    expect(results.filter((r) => r.status === 'fulfilled')).toHaveLength(1);
    expect(results.find((r) => r.status === 'rejected')).toMatchObject({ reason: { status: 409 } });
    const [p] = await db.select().from(payments).where(eq(payments.ticketId, t.id));
    const duplicate = db.insert(payments).values({ ...p!, id: unique('pay'), checkNumber: '3' });
    await expect(duplicate).rejects.toThrow();
  });

  it('voids a paid ticket by a recorded reversal: only a manager, with a reason, nothing deleted', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await paidReady(world);
    const drawer = await openDrawer(db, world.clerk, world.storeId, '2000.00');
    await payTicket(db, world.clerk, t.id, { method: 'cash' });
    await expect(voidTicket(db, world.clerk, t.id, 'mistake')).rejects.toMatchObject({ status: 403 });
    const voided = await voidTicket(db, world.manager, t.id, 'seller returned the cash; items handed back');
    expect(voided.state).toBe('voided');
    expect(voided.payments.map((p) => p.kind)).toEqual(['payout', 'reversal']);
    expect(voided.lines).toHaveLength(3);
    const closed = await closeDrawer(db, world.manager, drawer.id, '2000.00');
    expect(closed.expectedMinor).toBe(200_000);
    await expect(voidTicket(db, world.manager, t.id, 'again')).rejects.toMatchObject({ status: 409 });
  });

  it('refuses electronic payout for now with a clear reason and leaves the ticket awaiting payment', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await paidReady(world);
    await expect(payTicket(db, world.clerk, t.id, { method: 'electronic' })).rejects.toMatchObject({ status: 422, issues: [{ path: 'method' }] });
    expect((await getTicket(db, world.clerk, t.id)).state).toBe('accepted');
  });

  it('rolls the whole payment back when a step fails: no payment, no tags, state unchanged', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const t = await paidReady(world);
    // A line of a ticket still being graded holds the tag the payment will want, so the tag step fails.
    // (Lines of a paid ticket are on the record and take no new tag.)
    const other = await draftWithLines(world);
    const [otherLine] = await db.select().from(ticketLines).where(and(eq(ticketLines.ticketId, other.id), eq(ticketLines.position, 1)));
    const wanted = `${world.storeCode}-${String(t.number).padStart(6, '0')}-01`;
    await db.update(ticketLines).set({ tagNumber: wanted }).where(eq(ticketLines.id, otherLine!.id));
    await expect(payTicket(db, world.clerk, t.id, { method: 'check', checkNumber: '10' })).rejects.toBeTruthy();
    const after = await getTicket(db, world.clerk, t.id);
    expect(after.state).toBe('accepted');
    expect(after.payments).toHaveLength(0);
    expect(after.lines.every((l) => l.tagNumber === null)).toBe(true);
    expect(await auditActions(t.id)).not.toContain('ticket.pay');
  });
});
