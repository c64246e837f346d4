import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { and, eq, sql } from 'drizzle-orm';
import { auditLog, outboxMessages, paymentExceptions, payments, providerEvents, tickets } from '@/db/schema';
import { createPaymentsFake, type PaymentsFake } from '../../fakes/payments/app';
import { signatureHeader } from '../../fakes/payments/webhooks';
import { recordAudit } from '@/features/audit/audit.server';
import { getTicket, voidTicket } from '@/features/counter/tickets.server';
import { openPaymentExceptions } from '@/features/payouts/exceptions.server';
import { applyDueEvents, handleWebhook, storeEvent, verifyWebhook } from '@/features/payouts/inbox.server';
import { recordManualRecovery, settlePaymentException } from '@/features/payouts/reversals.server';
import { retryDueSends } from '@/features/payouts/sending.server';
import { resetPaymentProvider } from '@/features/settlement/provider.server';
import { payElectronically, refreshPayoutAccount, startOnboarding } from '@/features/settlement/settlement.server';
import { testDb } from '../support/db';
import { usePaymentsFake } from '../support/payments';
import { makeCounterWorld, setSpots, type CounterWorld } from '../support/counter';
import { acceptedTicket } from '../support/tickets';
import { waitFor as until } from '../support/wait';

const db = testDb();
const SECRET = 'whsec_payouts_test';
let fake: PaymentsFake;
let hook: http.Server;
let hookUrl: string;

beforeAll(async () => {
  // Cupel's webhook handler behind a real HTTP listener, so signatures are checked on the bytes sent.
  hook = http.createServer((req, res) => {
    let raw = '';
    req.on('data', (c) => (raw += c));
    req.on('end', async () => {
      try {
        const result = await handleWebhook(db, raw, (req.headers['stripe-signature'] as string) ?? null);
        res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(result));
      } catch (err) {
        res.writeHead((err as { status?: number }).status ?? 500).end();
      }
    });
  });
  await new Promise<void>((r) => hook.listen(0, '127.0.0.1', r));
  hookUrl = `http://127.0.0.1:${(hook.address() as AddressInfo).port}/webhook`;
  // Payouts stay pending until a test settles them, so each test says when the provider pays.
  fake = await createPaymentsFake({ port: 0, webhookUrl: hookUrl, webhookSecret: SECRET, payoutDelayMs: 600_000, dataDir: null, webhookRetryBaseMs: 50, log: () => {} });
  usePaymentsFake(fake, { secretKey: 'sk_test_payouts', webhookSecret: SECRET });
});

afterAll(async () => {
  await fake?.close();
  await new Promise((r) => hook?.close(r));
  resetPaymentProvider();
});

async function onboardedWorld() {
  const w = await makeCounterWorld(db);
  await setSpots(db, w, { gold: '2400.00', silver: '30.00' });
  const { url } = await startOnboarding(db, w.clerk, w.sellerId);
  const res = await fetch(url, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ method: 'card', card_number: '4000056655665556', card_exp: '12/30', card_name: 'Pat Example' }),
    redirect: 'manual',
  });
  expect(res.status).toBe(303);
  const account = await until('the account to be onboarded', async () => {
    const a = await refreshPayoutAccount(db, w.sellerId);
    return a?.payoutsEnabled ? a : null;
  });
  return { w, account };
}

const paymentsOf = (ticketId: string) => db.select().from(payments).where(eq(payments.ticketId, ticketId)).orderBy(payments.createdAt);
const transfersTo = (accountId: string) => Object.values(fake.state.transfers).filter((t) => t.destination === accountId);
const payoutsOf = (accountId: string) => Object.values(fake.state.payouts).filter((p) => p.account === accountId);
const auditActions = async (ticketId: string) => (await db.select().from(auditLog).where(eq(auditLog.entityId, ticketId)).orderBy(auditLog.id)).map((a) => a.action);
/** Far enough ahead that every backoff is over, so the worker's pass picks the payment up now. */
const later = () => new Date(Date.now() + 60 * 60_000);

async function paidElectronically(w: CounterWorld, accountId: string) {
  const t = await acceptedTicket(db, w);
  const payment = await payElectronically(db, w.clerk, t.id);
  fake.settlePayout(payment!.providerPayoutId!, 'paid');
  await until('the ticket to be paid', async () => (await getTicket(db, w.clerk, t.id)).state === 'paid');
  expect(transfersTo(accountId)).toHaveLength(1);
  return { t, payment: payment! };
}

describe('voiding a ticket while money moves', () => {
  it('refuses to void a ticket whose electronic payout is pending: 409 naming the payout', async () => {
    const { w } = await onboardedWorld();
    const t = await acceptedTicket(db, w);
    const payment = await payElectronically(db, w.clerk, t.id);
    expect(payment!.state).toBe('pending');
    const err = await voidTicket(db, w.manager, t.id, 'seller changed their mind').catch((e) => e);
    expect(err).toMatchObject({ status: 409, issues: [{ path: 'payment', message: payment!.id }] });
    expect(err.message).toContain(payment!.id);
    expect(err.message).toContain(payment!.providerPayoutId!);
    const [row] = await db.select().from(tickets).where(eq(tickets.id, t.id));
    expect(row!.state).toBe('accepted');
    expect(await paymentsOf(t.id)).toHaveLength(1);
    fake.settlePayout(payment!.providerPayoutId!, 'paid');
    await until('the ticket to be paid', async () => (await getTicket(db, w.clerk, t.id)).state === 'paid');
  });

  it('a payout the provider completes on a ticket no longer accepted raises an exception for the manager and does not mark it paid', async () => {
    const { w, account } = await onboardedWorld();
    const t = await acceptedTicket(db, w);
    const payment = await payElectronically(db, w.clerk, t.id);
    // The ticket is voided behind the payout's back, as the code allowed before this rule or a hand edit in the database would.
    // Even a hand edit must come with its audit row: the database refuses a change to a record on file without one.
    await db.transaction(async (tx) => {
      await tx.update(tickets).set({ state: 'voided', voidedAt: new Date(), voidedBy: w.manager.id, voidReason: 'voided while the payout was on its way' }).where(eq(tickets.id, t.id));
      await recordAudit(tx, { storeId: w.storeId, actorUserId: w.manager.id, action: 'ticket.void', entity: 'ticket', entityId: t.id, before: { state: 'accepted' }, after: { state: 'voided' } });
    });
    fake.settlePayout(payment!.providerPayoutId!, 'paid');
    const [exception] = await until('the exception to be raised', async () => {
      const rows = await db.select().from(paymentExceptions).where(eq(paymentExceptions.ticketId, t.id));
      return rows.length ? rows : null;
    });
    expect(exception).toMatchObject({ kind: 'payout-on-closed-ticket', paymentId: payment!.id, resolvedAt: null });
    expect(exception!.message).toContain(payment!.providerPayoutId!);
    const view = await getTicket(db, w.manager, t.id);
    expect(view.state).toBe('voided');
    expect(view.paidAt).toBeNull();
    // The money did leave: the payout is completed, and nothing says it came back.
    expect(view.payments.map((p) => `${p.kind}:${p.state}`)).toEqual(['payout:completed']);
    const actions = await auditActions(t.id);
    expect(actions).toContain('payment.exception-raised');
    expect(actions).not.toContain('ticket.pay');
    expect(await db.select().from(outboxMessages).where(and(eq(outboxMessages.attachTicketReceiptId, t.id)))).toHaveLength(0);
    expect((await openPaymentExceptions(db, w.storeId)).map((e) => e.id)).toEqual([exception!.id]);

    // The manager asks the provider to take it back: a pending reversal, completed by the provider's answer.
    const settled = await settlePaymentException(db, w.manager, exception!.id, { action: 'reverse', note: 'seller was told; reversing the transfer' });
    const [, reversal] = await paymentsOf(t.id);
    expect(reversal).toMatchObject({ id: settled.reversalId, kind: 'reversal', state: 'completed', providerReversalId: expect.stringMatching(/^trr_/) });
    expect(transfersTo(account.providerAccountId)[0]!.reversed).toBe(true);
    expect(await openPaymentExceptions(db, w.storeId)).toHaveLength(0);
  });

  it('voiding a paid electronic ticket records a pending reversal that only the provider\u2019s confirmation completes', async () => {
    const { w, account } = await onboardedWorld();
    const { t, payment } = await paidElectronically(w, account.providerAccountId);
    fake.addFault({ next: '500', path: '/v1/transfers/', method: 'POST' });
    const voided = await voidTicket(db, w.manager, t.id, 'items reported stolen; seller refunded');
    expect(voided.state).toBe('voided');
    const reversal = voided.payments.find((p) => p.kind === 'reversal');
    expect(reversal).toMatchObject({ state: 'pending', reversesPaymentId: payment.id, providerReversalId: null, lastError: expect.stringMatching(/^transfer reversal: /) });
    const [returned] = await db.execute<{ n: string }>(sql`select count(*)::text as n from payments where ticket_id = ${t.id} and kind = 'reversal' and state = 'completed'`);
    expect(returned!.n).toBe('0');
    expect(transfersTo(account.providerAccountId)[0]!.amount_reversed).toBe(0);
    // A completed electronic reversal without a confirmation or a manager's record is refused by the database itself.
    await expect(db.update(payments).set({ state: 'completed' }).where(eq(payments.id, reversal!.id))).rejects.toThrow();

    const outcomes = await retryDueSends(db, { now: later() });
    expect(outcomes).toContainEqual({ paymentId: reversal!.id, outcome: 'completed' });
    const [done] = await db.select().from(payments).where(eq(payments.id, reversal!.id));
    expect(done).toMatchObject({ state: 'completed', providerReversalId: expect.stringMatching(/^trr_/), recoveryNote: null });
    expect(transfersTo(account.providerAccountId)[0]!.amount_reversed).toBe(payment.amountMinor);
    expect(await auditActions(t.id)).toEqual(expect.arrayContaining(['ticket.void', 'payment.reversal-pending', 'payment.reversal-retry-needed', 'payment.reversal-confirmed']));
  });

  it('a manager can record money recovered another way for a pending reversal; a clerk cannot', async () => {
    const { w, account } = await onboardedWorld();
    const { t } = await paidElectronically(w, account.providerAccountId);
    fake.addFault({ next: '500', path: '/v1/transfers/', method: 'POST' });
    const voided = await voidTicket(db, w.manager, t.id, 'seller returned the money in cash');
    const reversal = voided.payments.find((p) => p.kind === 'reversal')!;
    expect(reversal.state).toBe('pending');
    await expect(recordManualRecovery(db, w.clerk, reversal.id, 'n/a')).rejects.toMatchObject({ status: 403 });
    const recorded = await recordManualRecovery(db, w.manager, reversal.id, 'Seller handed back the full amount in cash, counted by two staff');
    expect(recorded.state).toBe('completed');
    const [row] = await db.select().from(payments).where(eq(payments.id, reversal.id));
    expect(row).toMatchObject({ state: 'completed', completedBy: w.manager.id, recoveryNote: expect.stringContaining('cash') });
    // Nothing is left due for the provider, so the money is not taken back a second time.
    expect((await retryDueSends(db, { now: later() })).map((o) => o.paymentId)).not.toContain(reversal.id);
    expect(transfersTo(account.providerAccountId)[0]!.amount_reversed).toBe(0);
  });
});

describe('a failed call is not a failed payout', () => {
  it('the provider answering 409 (key in use) to a second sender leaves the payment pending, and it pays once', async () => {
    const { w, account } = await onboardedWorld();
    const t = await acceptedTicket(db, w);
    fake.addFault({ next: 'slow', path: '/v1/transfers', method: 'POST', delayMs: 1200 });
    const first = payElectronically(db, w.clerk, t.id);
    const [leased] = await until('the first sender to hold the payment', async () => {
      const rows = await paymentsOf(t.id);
      return rows[0]?.sendingSince ? rows : null;
    });
    // The first sender looks stalled (its lease is made to look expired), so the worker sends the same request again.
    await db.update(payments).set({ sendingSince: new Date(Date.now() - 3_600_000) }).where(eq(payments.id, leased!.id));
    const second = await retryDueSends(db);
    expect(second).toContainEqual({ paymentId: leased!.id, outcome: 'pending' });
    const retryAudit = await db.select().from(auditLog).where(and(eq(auditLog.entityId, t.id), eq(auditLog.action, 'payment.electronic-retry-needed')));
    expect(retryAudit.map((a) => (a.after as { status: number; code: string }).status)).toEqual([409]);
    expect((retryAudit[0]!.after as { code: string }).code).toBe('idempotency_key_in_use');
    const sent = await first;
    expect(sent).toMatchObject({ id: leased!.id, state: 'pending', providerPayoutId: expect.stringMatching(/^po_/) });
    fake.settlePayout(sent!.providerPayoutId!, 'paid');
    await until('the ticket to be paid', async () => (await getTicket(db, w.clerk, t.id)).state === 'paid');
    expect(transfersTo(account.providerAccountId)).toHaveLength(1);
    expect(payoutsOf(account.providerAccountId)).toHaveLength(1);
    expect(await paymentsOf(t.id)).toHaveLength(1);
  });

  for (const fault of [
    { name: 'a 429', input: { next: '429' as const } },
    { name: 'a dropped connection', input: { next: 'timeout' as const, process: false, delayMs: 50 } },
  ]) {
    it(`a transfer that succeeded before the payout call met ${fault.name} is reused by the retry, never sent twice`, async () => {
      const { w, account } = await onboardedWorld();
      const t = await acceptedTicket(db, w);
      // The SDK reconnects once by itself after a closed connection, so a dropped connection is dropped twice.
      fake.addFault({ ...fault.input, path: '/v1/payouts', method: 'POST', count: fault.input.next === 'timeout' ? 2 : 1 });
      const answered = await payElectronically(db, w.clerk, t.id);
      expect(answered).toMatchObject({ state: 'pending', providerTransferId: expect.stringMatching(/^tr_/), providerPayoutId: null, sendingSince: null, lastError: expect.stringMatching(/^payout: /) });
      expect(answered!.nextSendAt!.getTime()).toBeGreaterThan(Date.now());
      expect(transfersTo(account.providerAccountId)).toHaveLength(1);
      // Not due yet: the worker waits out the backoff.
      expect((await retryDueSends(db)).map((o) => o.paymentId)).not.toContain(answered!.id);
      const retried = await retryDueSends(db, { now: later() });
      expect(retried).toContainEqual({ paymentId: answered!.id, outcome: 'pending' });
      const [sent] = await paymentsOf(t.id);
      expect(sent!.providerTransferId).toBe(answered!.providerTransferId);
      expect(transfersTo(account.providerAccountId)).toHaveLength(1);
      expect(payoutsOf(account.providerAccountId)).toHaveLength(1);
      fake.settlePayout(sent!.providerPayoutId!, 'paid');
      await until('the ticket to be paid', async () => (await getTicket(db, w.clerk, t.id)).state === 'paid');
      expect(fake.state.accounts[account.providerAccountId]!.balance.usd).toBe(0);
    });
  }

  it('a payout the provider fails takes the transfer back before the payment counts as failed', async () => {
    const { w, account } = await onboardedWorld();
    const t = await acceptedTicket(db, w);
    fake.addFault({ next: 'decline-payout' });
    const payment = await payElectronically(db, w.clerk, t.id);
    fake.settlePayout(payment!.providerPayoutId!, 'failed');
    const [failed] = await until('the payout to fail', async () => {
      const rows = await paymentsOf(t.id);
      return rows[0]?.state === 'failed' ? rows : null;
    });
    expect(failed!.failureReason).toBeTruthy();
    const [transfer] = transfersTo(account.providerAccountId);
    expect(transfer!.amount_reversed).toBe(payment!.amountMinor);
    expect(fake.state.accounts[account.providerAccountId]!.balance.usd).toBe(0);
    expect((await getTicket(db, w.clerk, t.id)).state).toBe('accepted');
  });
});

describe('the webhook inbox', () => {
  it('an event stored just before a crash is applied once after the restart, and its redelivery changes nothing', async () => {
    const { w } = await onboardedWorld();
    const t = await acceptedTicket(db, w);
    const payment = await payElectronically(db, w.clerk, t.id);
    fake.setWebhookUrl(null);
    try {
      fake.settlePayout(payment!.providerPayoutId!, 'paid');
    } finally {
      fake.setWebhookUrl(hookUrl);
    }
    const event = fake.state.events.find((e) => e.type === 'payout.paid' && (e.data.object as { id: string }).id === payment!.providerPayoutId)!;
    const raw = JSON.stringify(event, null, 2);
    const signature = signatureHeader(raw, SECRET);
    // The route's first half ran (verified and stored) and the process died before applying it.
    expect(await storeEvent(db, verifyWebhook(raw, signature), raw)).toBe(true);
    const [stored] = await db.select().from(providerEvents).where(eq(providerEvents.eventId, event.id));
    expect(stored).toMatchObject({ state: 'received', appliedAt: null });
    expect((await getTicket(db, w.clerk, t.id)).state).toBe('accepted');

    // After the restart the worker applies what is stored; the provider's redelivery is a duplicate.
    const outcomes = await applyDueEvents(db);
    expect(outcomes).toContainEqual({ eventId: event.id, outcome: 'applied' });
    expect((await applyDueEvents(db)).map((o) => o.eventId)).not.toContain(event.id);
    expect(await handleWebhook(db, raw, signature)).toEqual({ status: 'duplicate', type: 'payout.paid' });
    const [applied] = await db.select().from(providerEvents).where(eq(providerEvents.eventId, event.id));
    expect(applied).toMatchObject({ state: 'applied', attempts: 1 });
    expect((await getTicket(db, w.clerk, t.id)).state).toBe('paid');
    expect((await auditActions(t.id)).filter((a) => a === 'ticket.pay')).toHaveLength(1);
    const mails = await db.select().from(outboxMessages).where(and(eq(outboxMessages.storeId, w.storeId), eq(outboxMessages.kind, 'receipt')));
    expect(mails).toHaveLength(1);
  });

  it('a redelivery of an event stored but never applied applies it, once', async () => {
    const { w } = await onboardedWorld();
    const t = await acceptedTicket(db, w);
    const payment = await payElectronically(db, w.clerk, t.id);
    fake.setWebhookUrl(null);
    try {
      fake.settlePayout(payment!.providerPayoutId!, 'paid');
    } finally {
      fake.setWebhookUrl(hookUrl);
    }
    const event = fake.state.events.find((e) => e.type === 'payout.paid' && (e.data.object as { id: string }).id === payment!.providerPayoutId)!;
    const raw = JSON.stringify(event);
    await storeEvent(db, verifyWebhook(raw, signatureHeader(raw, SECRET)), raw);
    const [a, b] = await Promise.all([handleWebhook(db, raw, signatureHeader(raw, SECRET)), handleWebhook(db, raw, signatureHeader(raw, SECRET))]);
    expect([a.status, b.status].sort()).toEqual(['applied', 'duplicate']);
    expect((await auditActions(t.id)).filter((x) => x === 'ticket.pay')).toHaveLength(1);
  });
});
