import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createPaymentsFake, type PaymentsFake } from '../../fakes/payments/app';
import { canonical, parseForm } from '../../fakes/payments/form';
import { signatureHeader } from '../../fakes/payments/webhooks';

const KEY = 'sk_test_cupel_unit_0123456789';
const SECRET = 'whsec_cupel_unit_test';
const RETURN_URL = 'http://127.0.0.1:4321/seller/payouts/return';
const REFRESH_URL = 'http://127.0.0.1:4321/seller/payouts/refresh';

interface Received {
  body: string;
  signature: string;
  event: { id: string; type: string; account?: string; data: { object: Record<string, unknown> } };
}

/** A stand-in for Cupel's webhook route: records every delivery and answers with the planned statuses. */
class WebhookListener {
  received: Received[] = [];
  plan: number[] = [];
  server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const body = Buffer.concat(chunks).toString('utf8');
      this.received.push({ body, signature: String(req.headers['stripe-signature'] ?? ''), event: JSON.parse(body) });
      res.writeHead(this.plan.shift() ?? 200, { 'content-type': 'application/json' });
      res.end('{"received":true}');
    });
  });
  get url() {
    return `http://127.0.0.1:${(this.server.address() as AddressInfo).port}/api/payments/webhook`;
  }
  listen() {
    return new Promise<void>((resolve) => this.server.listen(0, '127.0.0.1', resolve));
  }
  close() {
    return new Promise<void>((resolve) => {
      this.server.close(() => resolve());
      this.server.closeAllConnections();
    });
  }
  ofType(type: string) {
    return this.received.filter((r) => r.event.type === type);
  }
}

async function waitFor<T>(probe: () => T | undefined | null | false, what: string, timeoutMs = 4_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 15));
  }
}

function client(fake: PaymentsFake, key = KEY) {
  return new Stripe(key, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0, timeout: 5000 });
}

async function caught(promise: Promise<unknown>): Promise<Stripe.errors.StripeError> {
  try {
    await promise;
  } catch (err) {
    return err as Stripe.errors.StripeError;
  }
  throw new Error('expected the call to fail');
}

const listener = new WebhookListener();
let fake: PaymentsFake;
let stripe: Stripe;

beforeAll(async () => {
  await listener.listen();
  fake = await createPaymentsFake({
    port: 0,
    webhookUrl: listener.url,
    webhookSecret: SECRET,
    payoutDelayMs: 80,
    webhookRetryBaseMs: 20,
    dataDir: null,
    log: () => {},
  });
  stripe = client(fake);
});

afterAll(async () => {
  await fake?.close();
  await listener.close();
});

beforeEach(() => {
  fake.reset();
  listener.received = [];
  listener.plan = [];
});

async function adminPost(route: string, body: unknown) {
  const res = await fetch(`${fake.url}${route}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  return { status: res.status, json: (await res.json()) as Record<string, unknown> };
}

async function newAccount(email = 'seller@example.test') {
  return stripe.accounts.create(
    {
      type: 'custom',
      country: 'US',
      email,
      business_type: 'individual',
      capabilities: { transfers: { requested: true } },
      metadata: { seller: 'S-100' },
    },
    { idempotencyKey: `acct-${email}-${Math.random()}` },
  );
}

async function onboard(accountId: string, form: Record<string, string> = { method: 'card' }) {
  const link = await stripe.accountLinks.create({ account: accountId, type: 'account_onboarding', refresh_url: REFRESH_URL, return_url: RETURN_URL });
  const page = await fetch(link.url);
  expect(page.status).toBe(200);
  const html = await page.text();
  const defaults = Object.fromEntries([...html.matchAll(/<input id="([a-z_]+)" name="\1" type="text" value="([^"]*)"/g)].map((m) => [m[1], m[2]]));
  const res = await fetch(link.url, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ ...defaults, ...form }).toString(),
    redirect: 'manual',
  });
  return { link, html, res };
}

async function onboardedWithFunds(amount = 50_000, form: Record<string, string> = { method: 'card' }) {
  const account = await newAccount();
  const { res } = await onboard(account.id, form);
  expect(res.status).toBe(303);
  await stripe.transfers.create({ amount, currency: 'usd', destination: account.id }, { idempotencyKey: `fund-${account.id}` });
  return stripe.accounts.retrieve(account.id);
}

describe('form parameters', () => {
  it('parses the SDK’s nested bracket encoding and compares parameters independent of order', () => {
    const params = parseForm('metadata[ticket]=T-1&capabilities[transfers][requested]=true&expand[0]=a&expand[1]=b&email=a%40b.test&note=x+y');
    expect(params).toEqual({ metadata: { ticket: 'T-1' }, capabilities: { transfers: { requested: 'true' } }, expand: ['a', 'b'], email: 'a@b.test', note: 'x y' });
    expect(canonical(parseForm('a=1&b[c]=2'))).toBe(canonical(parseForm('b[c]=2&a=1')));
    expect(() => parseForm('__proto__[x]=1')).toThrow();
    expect(() => parseForm('a=1&a[b]=2')).toThrow();
  });
});

describe('payout flow through the SDK', () => {
  it('creates an account, onboards it with a test card, transfers, pays out and delivers signed webhooks', async () => {
    const account = await newAccount();
    expect(account).toMatchObject({
      object: 'account',
      email: 'seller@example.test',
      charges_enabled: false,
      payouts_enabled: false,
      details_submitted: false,
      external_accounts: { object: 'list', data: [] },
      metadata: { seller: 'S-100' },
      capabilities: { transfers: 'inactive' },
    });
    expect(account.id).toMatch(/^acct_[0-9A-Za-z]{16}$/);
    expect(Number.isInteger(account.created)).toBe(true);

    const { link, html, res } = await onboard(account.id);
    expect(link).toMatchObject({ object: 'account_link' });
    expect(link.url.startsWith(`${fake.url}/onboard/`)).toBe(true);
    expect(link.expires_at).toBeGreaterThan(link.created);
    expect(html).toContain('Test payout account setup (local test service)');
    expect(html).toContain("Cupel's local payments fake");
    expect(html).toContain('value="4000056655665556"');
    for (const [, id] of html.matchAll(/<input[^>]* id="([^"]+)"/g)) expect(html).toContain(`<label for="${id}">`);
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(RETURN_URL);

    const ready = await stripe.accounts.retrieve(account.id);
    expect(ready).toMatchObject({ details_submitted: true, payouts_enabled: true, charges_enabled: true, capabilities: { transfers: 'active' } });
    const card = ready.external_accounts?.data[0] as Stripe.Card;
    expect(card).toMatchObject({ object: 'card', brand: 'Visa', last4: '5556', exp_month: 12, exp_year: 2034, available_payout_methods: ['standard', 'instant'] });
    expect(card.id).toMatch(/^card_/);
    const updated = await waitFor(() => listener.ofType('account.updated')[0], 'account.updated');
    expect(updated.event.account).toBe(account.id);

    const platformBefore = await stripe.balance.retrieve();
    expect(platformBefore).toMatchObject({ object: 'balance', livemode: false, available: [{ amount: 100_000_000, currency: 'usd', source_types: { card: 100_000_000 } }] });

    const transfer = await stripe.transfers.create(
      { amount: 12_345, currency: 'usd', destination: account.id, metadata: { ticket: 'T-1' }, transfer_group: 'ticket_T-1' },
      { idempotencyKey: 'transfer-T-1' },
    );
    expect(transfer).toMatchObject({ object: 'transfer', amount: 12_345, currency: 'usd', destination: account.id, metadata: { ticket: 'T-1' }, reversed: false, livemode: false });
    expect(transfer.id).toMatch(/^tr_/);
    expect((await stripe.transfers.retrieve(transfer.id)).id).toBe(transfer.id);
    expect((await stripe.balance.retrieve()).available[0]?.amount).toBe(100_000_000 - 12_345);
    expect((await stripe.balance.retrieve({}, { stripeAccount: account.id })).available[0]?.amount).toBe(12_345);

    const payout = await stripe.payouts.create(
      { amount: 12_345, currency: 'usd', method: 'instant', metadata: { ticket: 'T-1' } },
      { stripeAccount: account.id, idempotencyKey: 'payout-T-1' },
    );
    expect(payout).toMatchObject({ object: 'payout', status: 'pending', method: 'instant', destination: card.id, failure_code: null, failure_message: null, metadata: { ticket: 'T-1' } });
    expect(payout.id).toMatch(/^po_/);
    expect((await stripe.balance.retrieve({}, { stripeAccount: account.id })).available[0]?.amount).toBe(0);

    const paid = await waitFor(() => listener.ofType('payout.paid')[0], 'payout.paid webhook');
    const event = stripe.webhooks.constructEvent(paid.body, paid.signature, SECRET);
    expect(event.type).toBe('payout.paid');
    expect(event.account).toBe(account.id);
    expect(event.id).toMatch(/^evt_/);
    expect(event.livemode).toBe(false);
    expect((event.data.object as Stripe.Payout).id).toBe(payout.id);
    expect((event.data.object as Stripe.Payout).status).toBe('paid');

    expect((await stripe.payouts.retrieve(payout.id, {}, { stripeAccount: account.id })).status).toBe('paid');
    const list = await stripe.payouts.list({ limit: 5 }, { stripeAccount: account.id });
    expect(list.data.map((p) => p.id)).toEqual([payout.id]);

    const events = await stripe.events.list({ limit: 10 }, { stripeAccount: account.id });
    expect(events.data[0]?.type).toBe('payout.paid');
    expect(events.data.map((e) => e.type)).toEqual(['payout.paid', 'payout.created', 'account.updated']);
    await waitFor(() => fake.state.events.find((e) => e.id === event.id)?.pending_webhooks === 0, 'pending_webhooks to reach 0');
    expect((await stripe.events.retrieve(event.id, {}, { stripeAccount: account.id })).pending_webhooks).toBe(0);
    const platformEvents = await stripe.events.list();
    expect(platformEvents.data.map((e) => e.type)).toEqual(['transfer.created']);
  });

  it('onboards with a test bank account, which takes standard payouts only', async () => {
    const account = await onboardedWithFunds(10_000, { method: 'bank' });
    const bank = account.external_accounts?.data[0] as Stripe.BankAccount;
    expect(bank).toMatchObject({ object: 'bank_account', bank_name: 'TEST BANK', last4: '6789', routing_number: '110000000', available_payout_methods: ['standard'] });
    expect(bank.id).toMatch(/^ba_/);
    const err = await caught(stripe.payouts.create({ amount: 1_000, currency: 'usd', method: 'instant' }, { stripeAccount: account.id }));
    expect(err.statusCode).toBe(400);
    expect(err.code).toBe('instant_payouts_unsupported');
    const payout = await stripe.payouts.create({ amount: 1_000, currency: 'usd', method: 'standard' }, { stripeAccount: account.id });
    expect(payout).toMatchObject({ destination: bank.id, type: 'bank_account', status: 'pending' });
    expect(payout.arrival_date).toBeGreaterThan(payout.created);
  });

  it('shows the form again, with the errors announced and linked, when the card details are wrong', async () => {
    const account = await newAccount();
    const { res } = await onboard(account.id, { method: 'card', card_number: '4000 0000 0000 0001', card_exp: '13/20' });
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain('role="alert"');
    expect(html).toContain('<a href="#card_number">');
    expect(html).toMatch(/id="card_number"[^>]*aria-describedby="card_number-hint card_number-error"[^>]*aria-invalid="true"/);
    expect(html).toMatch(/id="card_exp"[^>]*aria-invalid="true"/);
    expect((await stripe.accounts.retrieve(account.id)).payouts_enabled).toBe(false);
  });

  it('refuses a transfer to an account that has not onboarded, and a payout larger than the balance', async () => {
    const fresh = await newAccount();
    const transferErr = await caught(stripe.transfers.create({ amount: 100, currency: 'usd', destination: fresh.id }));
    expect(transferErr).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(transferErr).toMatchObject({ statusCode: 400, code: 'account_invalid', param: 'destination', rawType: 'invalid_request_error' });

    const account = await onboardedWithFunds(500);
    const payoutErr = await caught(stripe.payouts.create({ amount: 501, currency: 'usd' }, { stripeAccount: account.id }));
    expect(payoutErr).toMatchObject({ statusCode: 400, code: 'balance_insufficient' });

    const missingParam = await caught(stripe.transfers.create({ currency: 'usd', destination: account.id } as Stripe.TransferCreateParams));
    expect(missingParam).toMatchObject({ statusCode: 400, code: 'parameter_missing', param: 'amount' });
    const unknownParam = await caught(stripe.transfers.create({ amount: 1, currency: 'usd', destination: account.id, colour: 'red' } as Stripe.TransferCreateParams));
    expect(unknownParam).toMatchObject({ statusCode: 400, code: 'parameter_unknown', param: 'colour' });
  });

  it('settles a payout on demand through the admin route', async () => {
    const slow = await createPaymentsFake({ port: 0, dataDir: null, payoutDelayMs: 60_000, log: () => {} });
    try {
      const s = client(slow);
      const account = await s.accounts.create({ email: 'slow@example.test' });
      const link = await s.accountLinks.create({ account: account.id, type: 'account_onboarding', refresh_url: REFRESH_URL, return_url: RETURN_URL });
      const form = new URLSearchParams({ method: 'card', card_number: '4000056655665556', card_exp: '12/34', card_name: 'Test Seller' });
      expect((await fetch(link.url, { method: 'POST', body: form, redirect: 'manual' })).status).toBe(303);
      await s.transfers.create({ amount: 700, currency: 'usd', destination: account.id });
      const payout = await s.payouts.create({ amount: 700, currency: 'usd' }, { stripeAccount: account.id });
      const res = await fetch(`${slow.url}/_fake/payouts/${payout.id}/settle?status=failed`, { method: 'POST' });
      expect(res.status).toBe(200);
      expect(await res.json()).toMatchObject({ id: payout.id, status: 'failed', failure_code: 'account_closed' });
      expect((await s.payouts.retrieve(payout.id, {}, { stripeAccount: account.id })).status).toBe('failed');
      expect((await s.balance.retrieve({}, { stripeAccount: account.id })).available[0]?.amount).toBe(700);
      expect((await fetch(`${slow.url}/_fake/payouts/${payout.id}/settle?status=paid`, { method: 'POST' })).status).toBe(400);
    } finally {
      await slow.close();
    }
  });
});

describe('idempotency', () => {
  it('replays the first response for the same key and parameters, and refuses the key with other parameters', async () => {
    const params = { email: 'same@example.test', metadata: { seller: 'S-1' } };
    const first = await stripe.accounts.create(params, { idempotencyKey: 'create-S-1' });
    const again = await stripe.accounts.create(params, { idempotencyKey: 'create-S-1' });
    expect(again.id).toBe(first.id);
    expect(again.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect(first.lastResponse.headers['idempotent-replayed']).toBeUndefined();
    expect(Object.keys(fake.state.accounts)).toHaveLength(1);

    const err = await caught(stripe.accounts.create({ ...params, email: 'other@example.test' }, { idempotencyKey: 'create-S-1' }));
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(err.statusCode).toBe(400);
    expect(err.rawType).toBe('idempotency_error');
    expect(err.message).toMatch(/^Keys for idempotent requests can only be used with the same parameters they were first used with/);

    const onBehalf = await caught(stripe.accounts.create(params, { idempotencyKey: 'create-S-1', stripeAccount: first.id }));
    expect(onBehalf.rawType).toBe('idempotency_error');
  });

  it('replays a refused payout rather than trying it again', async () => {
    const account = await onboardedWithFunds(100);
    const options = { stripeAccount: account.id, idempotencyKey: 'payout-too-big' };
    const first = await caught(stripe.payouts.create({ amount: 200, currency: 'usd' }, options));
    expect(first.code).toBe('balance_insufficient');
    await stripe.transfers.create({ amount: 500, currency: 'usd', destination: account.id });
    const second = await caught(stripe.payouts.create({ amount: 200, currency: 'usd' }, options));
    expect(second.code).toBe('balance_insufficient');
    expect(second.headers?.['idempotent-replayed']).toBe('true');
  });

  it('does not keep a 500 from the fault switch, so a retry with the same key goes through once', async () => {
    const account = await onboardedWithFunds(1);
    const fault = await adminPost('/_fake/faults', { next: '500', count: 1, path: '/v1/transfers' });
    expect(fault.status).toBe(200);
    const params = { amount: 2_500, currency: 'usd', destination: account.id };
    const err = await caught(stripe.transfers.create(params, { idempotencyKey: 'transfer-retry' }));
    expect(err).toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect(err).toMatchObject({ statusCode: 500, rawType: 'api_error' });
    const ok = await stripe.transfers.create(params, { idempotencyKey: 'transfer-retry' });
    const replay = await stripe.transfers.create(params, { idempotencyKey: 'transfer-retry' });
    expect(replay.id).toBe(ok.id);
    expect((await stripe.balance.retrieve({}, { stripeAccount: account.id })).available[0]?.amount).toBe(1 + 2_500);
  });

  it('carries out a request whose answer is lost, and the SDK’s automatic reconnect gets the stored answer', async () => {
    const account = await onboardedWithFunds(1);
    fake.addFault({ next: 'timeout', delayMs: 100, path: '/v1/transfers' });
    const transfer = await stripe.transfers.create({ amount: 300, currency: 'usd', destination: account.id }, { idempotencyKey: 'lost-answer' });
    expect(transfer.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect(Object.values(fake.state.transfers).filter((t) => t.amount === 300)).toHaveLength(1);
  });
});

describe('keys in use, rate limits and transfer reversals', () => {
  it('answers 409 idempotency_key_in_use to a second request with a key whose first request is still being carried out, then replays', async () => {
    const account = await onboardedWithFunds(1);
    fake.addFault({ next: 'slow', path: '/v1/transfers', delayMs: 400 });
    const params = { amount: 700, currency: 'usd', destination: account.id };
    const first = stripe.transfers.create(params, { idempotencyKey: 'in-use' });
    await new Promise((r) => setTimeout(r, 100));
    const second = await caught(stripe.transfers.create(params, { idempotencyKey: 'in-use' }));
    expect(second.statusCode).toBe(409);
    expect(second).toMatchObject({ rawType: 'idempotency_error', code: 'idempotency_key_in_use' });
    const done = await first;
    const third = await stripe.transfers.create(params, { idempotencyKey: 'in-use' });
    expect(third.id).toBe(done.id);
    expect(third.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect(Object.values(fake.state.transfers).filter((t) => t.amount === 700)).toHaveLength(1);
  });

  it('a request with another key is not held up by a key in use', async () => {
    const account = await onboardedWithFunds(1);
    fake.addFault({ next: 'slow', path: '/v1/transfers', delayMs: 300 });
    const first = stripe.transfers.create({ amount: 10, currency: 'usd', destination: account.id }, { idempotencyKey: 'slow-a' });
    const other = await stripe.transfers.create({ amount: 10, currency: 'usd', destination: account.id }, { idempotencyKey: 'slow-b' });
    expect(other.id).not.toBe((await first).id);
  });

  it('answers 429 rate_limit and 409 on demand, keeps neither, and the same key then goes through once', async () => {
    const account = await onboardedWithFunds(1);
    expect((await adminPost('/_fake/faults', { next: '429', path: '/v1/transfers' })).status).toBe(200);
    fake.addFault({ next: '409', path: '/v1/transfers' });
    const params = { amount: 900, currency: 'usd', destination: account.id };
    const limited = await caught(stripe.transfers.create(params, { idempotencyKey: 'limited' }));
    expect(limited).toBeInstanceOf(Stripe.errors.StripeRateLimitError);
    expect(limited).toMatchObject({ statusCode: 429, code: 'rate_limit' });
    const conflict = await caught(stripe.transfers.create(params, { idempotencyKey: 'limited' }));
    expect(conflict).toMatchObject({ statusCode: 409, code: 'idempotency_key_in_use' });
    const ok = await stripe.transfers.create(params, { idempotencyKey: 'limited' });
    expect(ok.lastResponse.headers['idempotent-replayed']).toBeUndefined();
    expect(Object.values(fake.state.transfers).filter((t) => t.amount === 900)).toHaveLength(1);
  });

  it('reverses a transfer once per key, moving the money back to the platform and sending transfer.reversed', async () => {
    const account = await onboardedWithFunds(2_000);
    const [transfer] = Object.values(fake.state.transfers);
    const platformBefore = fake.state.platform_balance.usd!;
    const reversal = await stripe.transfers.createReversal(transfer!.id, { amount: 2_000, metadata: { why: 'void' } }, { idempotencyKey: 'rev-1' });
    const again = await stripe.transfers.createReversal(transfer!.id, { amount: 2_000, metadata: { why: 'void' } }, { idempotencyKey: 'rev-1' });
    expect(again.id).toBe(reversal.id);
    expect(reversal).toMatchObject({ object: 'transfer_reversal', amount: 2_000, transfer: transfer!.id });
    expect(fake.state.platform_balance.usd).toBe(platformBefore + 2_000);
    expect((await stripe.balance.retrieve({}, { stripeAccount: account.id })).available[0]?.amount).toBe(0);
    expect((await stripe.transfers.retrieve(transfer!.id)).reversed).toBe(true);
    const more = await caught(stripe.transfers.createReversal(transfer!.id, { amount: 1 }, { idempotencyKey: 'rev-2' }));
    expect(more.code).toBe('transfer_reversal_exceeds_transfer');
    await waitFor(() => listener.ofType('transfer.reversed')[0], 'transfer.reversed');
  });
});

describe('payout outcomes and webhook delivery', () => {
  it('fails a payout when the fault switch says decline, returning the funds and sending payout.failed', async () => {
    const account = await onboardedWithFunds(4_000);
    fake.addFault({ next: 'decline-payout' });
    const payout = await stripe.payouts.create({ amount: 4_000, currency: 'usd' }, { stripeAccount: account.id });
    expect(payout.status).toBe('pending');
    const failed = await waitFor(() => listener.ofType('payout.failed')[0], 'payout.failed');
    const event = stripe.webhooks.constructEvent(failed.body, failed.signature, SECRET);
    expect(event.account).toBe(account.id);
    expect(event.data.object).toMatchObject({ id: payout.id, status: 'failed', failure_code: 'account_closed' });
    expect((event.data.object as Stripe.Payout).failure_message).toBeTruthy();
    expect((await stripe.balance.retrieve({}, { stripeAccount: account.id })).available[0]?.amount).toBe(4_000);
  });

  it('signs with the webhook secret only: another secret or a changed body fails verification', async () => {
    const account = await newAccount();
    await onboard(account.id);
    const delivery = await waitFor(() => listener.ofType('account.updated')[0], 'account.updated');
    expect(() => stripe.webhooks.constructEvent(delivery.body, delivery.signature, 'whsec_wrong')).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => stripe.webhooks.constructEvent(delivery.body.replace('account.updated', 'account.updatee'), delivery.signature, SECRET)).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
    expect(delivery.signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
    const t = Number(/t=(\d+)/.exec(delivery.signature)?.[1]);
    expect(signatureHeader(delivery.body, SECRET, t)).toBe(delivery.signature);
  });

  it('delivers the same event twice when asked to repeat a webhook', async () => {
    await adminPost('/_fake/faults', { next: 'repeat-webhook', delayMs: 20 });
    const account = await newAccount();
    await onboard(account.id);
    await waitFor(() => listener.ofType('account.updated').length === 2, 'two deliveries');
    const [a, b] = listener.ofType('account.updated');
    expect(a?.event.id).toBe(b?.event.id);
    expect(fake.state.deliveries.filter((d) => d.status === 'delivered')).toHaveLength(2);
  });

  it('retries with backoff while Cupel answers 500, then records the delivery', async () => {
    listener.plan = [500, 503];
    const account = await newAccount();
    await onboard(account.id);
    await waitFor(() => fake.state.deliveries[0]?.status === 'delivered', 'delivery after retries');
    const delivery = fake.state.deliveries[0];
    expect(delivery?.attempts.map((a) => a.status)).toEqual([500, 503, 200]);
    const gaps = delivery!.attempts.slice(1).map((a, i) => a.at - delivery!.attempts[i]!.at);
    expect(gaps[1]!).toBeGreaterThanOrEqual(gaps[0]! * 1.5);
    expect(fake.state.events[0]?.pending_webhooks).toBe(0);
    expect(listener.ofType('account.updated')).toHaveLength(3);
  });

  it('gives up after six attempts and leaves the event pending', async () => {
    listener.plan = [500, 500, 500, 500, 500, 500, 500];
    const account = await newAccount();
    await onboard(account.id);
    await waitFor(() => fake.state.deliveries[0]?.status === 'failed', 'delivery to give up');
    expect(fake.state.deliveries[0]?.attempts).toHaveLength(6);
    expect(fake.state.events[0]?.pending_webhooks).toBe(1);
  });

  it('holds back a webhook when asked to delay it, without holding back the API', async () => {
    await adminPost('/_fake/faults', { next: 'delay-webhook', delayMs: 300 });
    const account = await newAccount();
    const started = Date.now();
    await onboard(account.id);
    expect(Date.now() - started).toBeLessThan(300);
    expect(listener.received).toHaveLength(0);
    await waitFor(() => listener.received.length === 1, 'delayed webhook');
    expect(Date.now() - started).toBeGreaterThanOrEqual(290);
  });
});

describe('errors in the provider’s shapes', () => {
  it('answers 401 without a test secret key', async () => {
    const live = client(fake, 'sk_live_not_here_123456');
    const err = await caught(live.accounts.create({ email: 'x@example.test' }));
    expect(err).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(err.statusCode).toBe(401);
    const res = await fetch(`${fake.url}/v1/balance`);
    expect(res.status).toBe(401);
    expect(await res.json()).toMatchObject({ error: { type: 'invalid_request_error', message: expect.stringMatching(/did not provide an API key/) } });
  });

  it('answers 404 resource_missing for unknown ids', async () => {
    const account = await newAccount();
    const err = await caught(stripe.payouts.retrieve('po_doesnotexist', {}, { stripeAccount: account.id }));
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 404, code: 'resource_missing', param: 'id', rawType: 'invalid_request_error' });
    expect(err.message).toBe("No such payout: 'po_doesnotexist'");
    const res = await fetch(`${fake.url}/v1/accounts/acct_nope`, { headers: { authorization: `Bearer ${KEY}` } });
    expect(res.status).toBe(404);
    expect(await res.json()).toEqual({ error: { type: 'invalid_request_error', code: 'resource_missing', param: 'id', message: "No such account: 'acct_nope'" } });
  });
});

describe('state and process', () => {
  it('keeps accounts across a restart when given a data directory', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'cupel-payments-fake-'));
    try {
      const first = await createPaymentsFake({ port: 0, dataDir: dir, log: () => {} });
      const created = await client(first).accounts.create({ email: 'kept@example.test' }, { idempotencyKey: 'kept-1' });
      await first.close();
      const second = await createPaymentsFake({ port: 0, dataDir: dir, log: () => {} });
      try {
        const s = client(second);
        expect((await s.accounts.retrieve(created.id)).email).toBe('kept@example.test');
        const replay = await s.accounts.create({ email: 'kept@example.test' }, { idempotencyKey: 'kept-1' });
        expect(replay.id).toBe(created.id);
      } finally {
        await second.close();
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('starts as a foreground process, logs one ready line and stops on SIGTERM', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'cupel-payments-proc-'));
    const child = spawn(path.resolve('node_modules/.bin/tsx'), ['fakes/payments/server.ts'], {
      env: { ...process.env, FAKE_PAYMENTS_PORT: '0', FAKE_DATA_DIR: dir, FAKE_WEBHOOK_URL: '' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    try {
      let out = '';
      child.stdout.on('data', (c: Buffer) => (out += c.toString()));
      child.stderr.on('data', (c: Buffer) => (out += c.toString()));
      const url = await waitFor(() => /payments fake listening on (http:\/\/127\.0\.0\.1:\d+)/.exec(out)?.[1], 'ready line', 15_000);
      const health = await fetch(`${url}/_fake/health`);
      expect(await health.json()).toMatchObject({ ok: true });
      const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
      const stopAt = Date.now();
      child.kill('SIGTERM');
      expect(await exited).toBe(0);
      expect(Date.now() - stopAt).toBeLessThan(2_000);
    } finally {
      if (child.exitCode === null) child.kill('SIGKILL');
      rmSync(dir, { recursive: true, force: true });
    }
  }, 20_000);
});
