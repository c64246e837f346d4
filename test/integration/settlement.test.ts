import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { and, eq } from 'drizzle-orm';
import Stripe from 'stripe';
import { auditLog, outboxMessages, payments, tickets } from '@/db/schema';
import { createPaymentsFake, type PaymentsFake } from '../../fakes/payments/app';
import { getTicket, openDrawer, payTicket } from '@/features/counter/tickets.server';
import { resetPaymentProvider } from '@/features/settlement/provider.server';
import { handleWebhook } from '@/features/payouts/inbox.server';
import {
  payElectronically,
  reconcilePendingPayments,
  refreshPayoutAccount,
  startOnboarding,
} from '@/features/settlement/settlement.server';
import { testDb } from '../support/db';
import { usePaymentsFake } from '../support/payments';
import { makeCounterWorld, setSpots, type CounterWorld } from '../support/counter';
import { acceptedTicket } from '../support/tickets';
import { waitFor as until } from '../support/wait';

const db = testDb();
const SECRET = 'whsec_settlement_test';
let fake: PaymentsFake;
let hook: http.Server;
const received: { status: number; body: unknown }[] = [];

beforeAll(async () => {
  // Cupel's webhook handler behind a real HTTP listener, so signatures are checked on the bytes sent.
  hook = http.createServer((req, res) => {
    let raw = '';
    req.on('data', (c) => (raw += c));
    req.on('end', async () => {
      try {
        const result = await handleWebhook(db, raw, (req.headers['stripe-signature'] as string) ?? null);
        received.push({ status: 200, body: result });
        res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(result));
      } catch (err) {
        const status = (err as { status?: number }).status ?? 500;
        received.push({ status, body: String(err) });
        res.writeHead(status).end();
      }
    });
  });
  await new Promise<void>((r) => hook.listen(0, '127.0.0.1', r));
  fake = await createPaymentsFake({
    port: 0,
    webhookUrl: `http://127.0.0.1:${(hook.address() as AddressInfo).port}/webhook`,
    webhookSecret: SECRET,
    payoutDelayMs: 100,
    dataDir: null,
    webhookRetryBaseMs: 50,
  });
  usePaymentsFake(fake, { secretKey: 'sk_test_settlement', webhookSecret: SECRET });
});

afterAll(async () => {
  await fake?.close();
  await new Promise((r) => hook?.close(r));
  resetPaymentProvider();
});

/** The seller completes the fake provider's onboarding form with a test debit card. */
async function onboard(world: CounterWorld) {
  const { url } = await startOnboarding(db, world.clerk, world.sellerId);
  const res = await fetch(url, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ method: 'card', card_number: '4000056655665556', card_exp: '12/30', card_name: 'Pat Example' }),
    redirect: 'manual',
  });
  expect(res.status).toBe(303);
  return until('the account to be onboarded', async () => {
    const account = await refreshPayoutAccount(db, world.sellerId);
    return account?.payoutsEnabled ? account : null;
  });
}

async function paymentsOf(ticketId: string) {
  return db.select().from(payments).where(eq(payments.ticketId, ticketId));
}

function providerPayoutsFor(accountId: string) {
  return Object.values(fake.state.payouts).filter((p) => p.account === accountId);
}

async function world() {
  const w = await makeCounterWorld(db);
  await setSpots(db, w, { gold: '2400.00', silver: '30.00' });
  return w;
}

describe('electronic payouts through the provider SDK and the local fake', () => {
  it('onboards a seller: the masked card comes back from the provider', async () => {
    const w = await world();
    const account = await onboard(w);
    expect(account).toMatchObject({ payoutsEnabled: true, externalAccountKind: 'card', externalAccountLast4: '5556', instantAvailable: true });
    const [mail] = await db.select().from(outboxMessages).where(and(eq(outboxMessages.storeId, w.storeId), eq(outboxMessages.kind, 'onboarding-link')));
    expect(mail?.textBody).toContain('/onboard/');
  });

  it('pays end to end: pending until the provider\u2019s webhook says paid, then paid with tags and e-mails queued', async () => {
    const w = await world();
    const account = await onboard(w);
    const t = await acceptedTicket(db, w);
    const payment = await payElectronically(db, w.clerk, t.id);
    expect(payment).toMatchObject({ state: 'pending', method: 'electronic', providerPayoutId: expect.stringMatching(/^po_/) });
    expect((await getTicket(db, w.clerk, t.id)).state).toBe('accepted');
    const paid = await until('the ticket to be paid', async () => {
      const view = await getTicket(db, w.clerk, t.id);
      return view.state === 'paid' ? view : null;
    });
    expect(paid.payments).toMatchObject([{ state: 'completed', amountMinor: paid.payoutMinor }]);
    expect(paid.lines.every((l) => l.tagNumber)).toBe(true);
    expect(providerPayoutsFor(account.providerAccountId)).toHaveLength(1);
    const kinds = (await db.select().from(outboxMessages).where(eq(outboxMessages.storeId, w.storeId))).map((m) => m.kind).sort();
    expect(kinds).toEqual(['onboarding-link', 'payout-confirmation', 'receipt']);
    const actions = (await db.select().from(auditLog).where(eq(auditLog.entityId, t.id))).map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(['payment.electronic-start', 'payment.electronic-sent', 'ticket.pay']));
  });

  it('pays once when the same request arrives twice at the same moment (double click, two tabs)', async () => {
    const w = await world();
    const account = await onboard(w);
    const t = await acceptedTicket(db, w);
    const results = await Promise.allSettled([payElectronically(db, w.clerk, t.id), payElectronically(db, w.clerk, t.id), payElectronically(db, w.clerk, t.id)]);
    expect(results.some((r) => r.status === 'fulfilled')).toBe(true);
    const rows = await paymentsOf(t.id);
    expect(rows).toHaveLength(1);
    await until('the payout to settle', async () => (await getTicket(db, w.clerk, t.id)).state === 'paid');
    expect(providerPayoutsFor(account.providerAccountId)).toHaveLength(1);
    const again = await payElectronically(db, w.clerk, t.id).catch((e) => e);
    expect(again).toMatchObject({ status: 409 });
    expect(await paymentsOf(t.id)).toHaveLength(1);
  });

  it('pays once after a crash between the provider call and the database write', async () => {
    const w = await world();
    const account = await onboard(w);
    const t = await acceptedTicket(db, w);
    // The provider carries out the payout but the answer never arrives, so Cupel never writes the payout id;
    // with webhooks off too, only the reconciliation job can find out.
    const hookUrl = fake.webhookUrl;
    fake.setWebhookUrl(null);
    fake.addFault({ next: 'timeout', path: '/v1/payouts', method: 'POST', delayMs: 3000, process: true });
    const answered = await payElectronically(db, w.clerk, t.id);
    expect(answered).toMatchObject({ state: 'pending', providerPayoutId: null, sendingSince: null, lastError: expect.stringMatching(/^payout: /) });
    const [pending] = await paymentsOf(t.id);
    expect(pending).toMatchObject({ state: 'pending', providerPayoutId: null });
    expect(providerPayoutsFor(account.providerAccountId)).toHaveLength(1);
    const first = await reconcilePendingPayments(db, { olderThanMs: 0 });
    expect(first.find((o) => o.paymentId === pending!.id)).toBeDefined();
    const [sent] = await paymentsOf(t.id);
    expect(sent!.providerPayoutId).toBe(providerPayoutsFor(account.providerAccountId)[0]!.payout.id);
    // The payout settles at the provider; the next reconciliation asks for it and applies the outcome.
    await until('the provider to settle', async () => providerPayoutsFor(account.providerAccountId)[0]!.payout.status === 'paid');
    await reconcilePendingPayments(db, { olderThanMs: 0 });
    fake.setWebhookUrl(hookUrl);
    expect((await getTicket(db, w.clerk, t.id)).state).toBe('paid');
    expect(providerPayoutsFor(account.providerAccountId)).toHaveLength(1);
    expect(await paymentsOf(t.id)).toHaveLength(1);
  });

  it('a declined payout leaves the ticket awaiting payment with the reason, and it can be paid another way', async () => {
    const w = await world();
    await onboard(w);
    const t = await acceptedTicket(db, w);
    fake.addFault({ next: 'decline-payout' });
    await payElectronically(db, w.clerk, t.id);
    const [failed] = await until('the payout to fail', async () => {
      const rows = await paymentsOf(t.id);
      return rows[0]?.state === 'failed' ? rows : null;
    });
    expect(failed!.failureReason).toBeTruthy();
    const view = await getTicket(db, w.clerk, t.id);
    expect(view.state).toBe('accepted');
    await openDrawer(db, w.clerk, w.storeId, '3000.00');
    const paid = await payTicket(db, w.clerk, t.id, { method: 'cash' });
    expect(paid.state).toBe('paid');
    expect(paid.payments.map((p) => `${p.method}:${p.state}`)).toEqual(['electronic:failed', 'cash:completed']);
  });

  it('a 500 from the provider leaves a visible pending payment that a retry completes once', async () => {
    const w = await world();
    const account = await onboard(w);
    const t = await acceptedTicket(db, w);
    fake.addFault({ next: '500', path: '/v1/transfers', count: 1 });
    const answered = await payElectronically(db, w.clerk, t.id);
    expect(answered).toMatchObject({ state: 'pending', lastError: expect.stringMatching(/^transfer: /) });
    const [pending] = await paymentsOf(t.id);
    expect(pending!.state).toBe('pending');
    expect((await db.select().from(auditLog).where(and(eq(auditLog.entityId, t.id), eq(auditLog.action, 'payment.electronic-retry-needed')))).length).toBe(1);
    const retried = await payElectronically(db, w.clerk, t.id);
    expect(retried!.id).toBe(pending!.id);
    await until('the ticket to be paid', async () => (await getTicket(db, w.clerk, t.id)).state === 'paid');
    expect(providerPayoutsFor(account.providerAccountId)).toHaveLength(1);
  });

  it('refuses to pay a seller who has not onboarded', async () => {
    const w = await world();
    const t = await acceptedTicket(db, w);
    await expect(payElectronically(db, w.clerk, t.id)).rejects.toMatchObject({ status: 409, issues: [{ path: 'payoutAccount' }] });
    expect(await paymentsOf(t.id)).toHaveLength(0);
  });
});

describe('the webhook', () => {
  function signed(payload: string, secret = SECRET) {
    return Stripe.webhooks.generateTestHeaderString({ payload, secret });
  }

  it('refuses a bad signature with 400 and changes nothing', async () => {
    const payload = JSON.stringify({ id: 'evt_forged', object: 'event', type: 'payout.paid', data: { object: { id: 'po_x', object: 'payout', status: 'paid', metadata: {} } } });
    await expect(handleWebhook(db, payload, signed(payload, 'whsec_wrong'))).rejects.toMatchObject({ status: 400 });
    await expect(handleWebhook(db, payload, null)).rejects.toMatchObject({ status: 400 });
  });

  it('applies a repeated delivery of the same event only once', async () => {
    const w = await world();
    await onboard(w);
    const t = await acceptedTicket(db, w);
    fake.addFault({ next: 'repeat-webhook', count: 5 });
    await payElectronically(db, w.clerk, t.id);
    await until('the ticket to be paid', async () => (await getTicket(db, w.clerk, t.id)).state === 'paid');
    await until('the repeat to arrive', async () => received.some((r) => (r.body as { status?: string })?.status === 'duplicate'));
    const receipts = await db.select().from(outboxMessages).where(and(eq(outboxMessages.storeId, w.storeId), eq(outboxMessages.kind, 'receipt')));
    expect(receipts).toHaveLength(1);
    const pays = (await db.select().from(auditLog).where(and(eq(auditLog.entityId, t.id), eq(auditLog.action, 'ticket.pay')))).length;
    expect(pays).toBe(1);
    const [row] = await db.select().from(tickets).where(eq(tickets.id, t.id));
    expect(row!.state).toBe('paid');
  });
});
