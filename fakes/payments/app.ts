/**
 * Cupel's local payments fake: the part of the payment provider's REST API that Cupel uses
 * (connected accounts, onboarding links, transfers, payouts, balance, events, signed webhooks),
 * spoken to through the provider's official SDK. Loopback only; test keys only.
 */
import { createHash, randomBytes } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import type Stripe from 'stripe';
import { FormError, canonical, parseForm, type Param, type Params } from './form.js';
import {
  PAGE_TITLE,
  defaultValues,
  renderMessagePage,
  renderOnboardingPage,
  validate,
  valuesFromForm,
  type Submission,
} from './onboarding.js';
import {
  StateFile,
  emptyState,
  loadState,
  type AccountRecord,
  type Balances,
  type DeliveryRecord,
  type FakeState,
  type IdempotencyRecord,
  type LinkRecord,
  type PayoutRecord,
} from './state.js';
import { assertLoopbackUrl, postWebhook } from './webhooks.js';

export interface PaymentsFakeOptions {
  /** 0 picks a free port. Default 12111. */
  port?: number;
  /** Base of account-link URLs. Default http://127.0.0.1:<port>. */
  publicUrl?: string;
  /** Where events are POSTed; null or empty sends none. Must be on 127.0.0.1/localhost. */
  webhookUrl?: string | null;
  webhookSecret?: string;
  payoutDelayMs?: number;
  /** Platform's starting available balance in minor units (usd). */
  platformBalance?: number;
  /** State is kept in <dataDir>/payments/state.json; null keeps it in memory only. */
  dataDir?: string | null;
  webhookRetryBaseMs?: number;
  webhookMaxAttempts?: number;
  webhookMaxRetryDelayMs?: number;
  webhookTimeoutMs?: number;
  idempotencyTtlMs?: number;
  log?: (line: string) => void;
}

export type FaultKind = '500' | '409' | '429' | 'slow' | 'timeout' | 'decline-payout' | 'delay-webhook' | 'repeat-webhook';

export interface FaultInput {
  next: FaultKind;
  count?: number;
  delayMs?: number;
  /** Only requests whose path starts with this ("/v1/payouts"); for 500, 409, 429, slow and timeout. */
  path?: string;
  /** Only requests with this method; for 500, 409, 429, slow and timeout. */
  method?: string;
  /** For timeout: carry the request out before dropping the answer (default true). */
  process?: boolean;
}

export interface Fault {
  id: string;
  kind: FaultKind;
  remaining: number;
  delayMs: number;
  path: string | null;
  method: string | null;
  process: boolean;
}

export interface PaymentsFake {
  server: http.Server;
  url: string;
  port: number;
  webhookSecret: string;
  /** The live state; read it, don't write it. */
  readonly state: FakeState;
  readonly faults: readonly Fault[];
  readonly webhookUrl: string | null;
  setWebhookUrl(url: string | null): void;
  addFault(input: FaultInput): Fault;
  clearFaults(): void;
  settlePayout(id: string, status: 'paid' | 'failed'): Stripe.Payout;
  reset(): void;
  /** Writes the state file now (no-op without a data directory). */
  flush(): void;
  close(): Promise<void>;
}

export const DEFAULT_PORT = 12111;
export const DEFAULT_WEBHOOK_SECRET = 'whsec_cupel_local_only';
export const DEFAULT_PLATFORM_BALANCE = 100_000_000;
export const DEFAULT_PAYOUT_DELAY_MS = 300;
const DEFAULT_TIMEOUT_FAULT_MS = 15_000;
const DEFAULT_WEBHOOK_DELAY_MS = 2_000;
const MAX_FAULT_DELAY_MS = 120_000;
const MAX_BODY_BYTES = 1_000_000;
const LINK_LIFETIME_S = 300;
const MAX_EVENTS = 10_000;
const DAY_MS = 86_400_000;
const CURRENCIES = new Set(['usd']);
const ACCOUNT_REQUIREMENTS = ['external_account', 'tos_acceptance.date', 'tos_acceptance.ip'];

/** Reads the fake's settings from the environment variables the start script exports. */
export function optionsFromEnv(env: NodeJS.ProcessEnv = process.env): PaymentsFakeOptions {
  const int = (name: string, fallback: number) => {
    const raw = env[name];
    if (raw === undefined || raw === '') return fallback;
    const n = Number(raw);
    if (!Number.isInteger(n) || n < 0) throw new Error(`${name} must be a whole number, got ${raw}`);
    return n;
  };
  const port = int('FAKE_PAYMENTS_PORT', DEFAULT_PORT);
  if (port > 65535) throw new Error(`FAKE_PAYMENTS_PORT must be a port number, got ${port}`);
  return {
    port,
    publicUrl: env.FAKE_PUBLIC_URL || undefined,
    webhookUrl: env.FAKE_WEBHOOK_URL || null,
    webhookSecret: env.FAKE_WEBHOOK_SECRET || DEFAULT_WEBHOOK_SECRET,
    payoutDelayMs: int('FAKE_PAYOUT_DELAY_MS', DEFAULT_PAYOUT_DELAY_MS),
    platformBalance: int('FAKE_PLATFORM_BALANCE', DEFAULT_PLATFORM_BALANCE),
    dataDir: env.FAKE_DATA_DIR || path.resolve('.local/fakes'),
  };
}

class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly error: { type: string; message: string; code?: string; param?: string },
    /** Business outcomes are kept under the idempotency key; malformed requests are not. */
    readonly storable = false,
  ) {
    super(error.message);
  }
}

function invalid(message: string, param?: string, code?: string, status = 400): ApiError {
  return new ApiError(status, { type: 'invalid_request_error', message, ...(code ? { code } : {}), ...(param ? { param } : {}) });
}

function missing(kind: string, id: string, param = 'id'): ApiError {
  return invalid(`No such ${kind}: '${id}'`, param, 'resource_missing', 404);
}

function businessError(message: string, code: string, param?: string): ApiError {
  return new ApiError(400, { type: 'invalid_request_error', message, code, ...(param ? { param } : {}) }, true);
}

const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';
function newId(prefix: string, length = 24): string {
  const bytes = randomBytes(length);
  let out = '';
  for (const b of bytes) out += ALPHABET[b % ALPHABET.length];
  return `${prefix}_${out}`;
}

const nowS = () => Math.floor(Date.now() / 1000);

function clone<T>(value: T): T {
  return structuredClone(value);
}

// ---- parameter readers -------------------------------------------------------------------

function allowOnly(params: Params, allowed: readonly string[]): void {
  for (const key of Object.keys(params)) {
    if (!allowed.includes(key)) throw invalid(`Received unknown parameter: ${key}`, key, 'parameter_unknown');
  }
}

function readString(params: Params, name: string, required: true): string;
function readString(params: Params, name: string, required?: false): string | undefined;
function readString(params: Params, name: string, required = false): string | undefined {
  const value = params[name];
  if (value === undefined) {
    if (required) throw invalid(`Missing required param: ${name}.`, name, 'parameter_missing');
    return undefined;
  }
  if (typeof value !== 'string') throw invalid(`Invalid string: ${name} must be a string.`, name);
  if (required && value === '') {
    throw invalid(`You passed an empty string for '${name}'. We assume empty values are an attempt to unset a parameter; however '${name}' cannot be unset.`, name, 'parameter_invalid_empty');
  }
  return value;
}

function readAmount(params: Params, name = 'amount'): number {
  const raw = readString(params, name, true);
  if (!/^\d+$/.test(raw)) throw invalid(`Invalid integer: ${raw}`, name, 'parameter_invalid_integer');
  const amount = Number(raw);
  if (!Number.isSafeInteger(amount)) throw invalid(`Invalid integer: ${raw}`, name, 'parameter_invalid_integer');
  if (amount < 1) throw invalid('This value must be greater than or equal to 1.', name, 'amount_too_small');
  return amount;
}

function readCurrency(params: Params): string {
  const currency = readString(params, 'currency', true).toLowerCase();
  if (!CURRENCIES.has(currency)) throw invalid(`Invalid currency: ${currency}. This local payments fake supports usd only.`, 'currency');
  return currency;
}

function readUrl(params: Params, name: string): string {
  const raw = readString(params, name, true);
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    throw invalid('Not a valid URL', name, 'url_invalid');
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:') throw invalid('Not a valid URL', name, 'url_invalid');
  return raw;
}

/** Metadata as the provider treats it: string values, "" removes a key, metadata="" clears all. */
function applyMetadata(existing: Stripe.Metadata, value: Param | undefined): Stripe.Metadata {
  if (value === undefined) return existing;
  if (value === '') return {};
  if (typeof value === 'string') throw invalid('Invalid object', 'metadata');
  const entries = Array.isArray(value) ? value.map((v, i) => [String(i), v] as const) : Object.entries(value);
  const next: Stripe.Metadata = { ...existing };
  for (const [key, v] of entries) {
    if (typeof v !== 'string') throw invalid(`Invalid value for metadata[${key}]: must be a string.`, `metadata[${key}]`);
    if (key.length > 40) throw invalid(`Metadata keys can have up to 40 characters; "${key}" has ${key.length}.`, `metadata[${key}]`);
    if (v.length > 500) throw invalid(`Metadata values can have up to 500 characters; metadata[${key}] has ${v.length}.`, `metadata[${key}]`);
    if (v === '') delete next[key];
    else next[key] = v;
  }
  if (Object.keys(next).length > 50) throw invalid('Metadata can have up to 50 keys.', 'metadata');
  return next;
}

function listOf<T extends { id: string }>(newestFirst: T[], query: Params, url: string): Stripe.ApiList<T> {
  const rawLimit = readString(query, 'limit');
  let limit = 10;
  if (rawLimit !== undefined) {
    if (!/^\d+$/.test(rawLimit)) throw invalid(`Invalid integer: ${rawLimit}`, 'limit', 'parameter_invalid_integer');
    limit = Number(rawLimit);
    if (limit < 1 || limit > 100) throw invalid('This value must be between 1 and 100.', 'limit');
  }
  const after = readString(query, 'starting_after');
  const before = readString(query, 'ending_before');
  let items = newestFirst;
  let hasMore: boolean;
  if (after) {
    const i = items.findIndex((item) => item.id === after);
    if (i < 0) throw invalid(`No such object: '${after}'`, 'starting_after', 'resource_missing');
    items = items.slice(i + 1);
    hasMore = items.length > limit;
    items = items.slice(0, limit);
  } else if (before) {
    const i = items.findIndex((item) => item.id === before);
    if (i < 0) throw invalid(`No such object: '${before}'`, 'ending_before', 'resource_missing');
    items = items.slice(0, i);
    hasMore = items.length > limit;
    items = items.slice(Math.max(0, items.length - limit));
  } else {
    hasMore = items.length > limit;
    items = items.slice(0, limit);
  }
  return { object: 'list', data: items, has_more: hasMore, url };
}

// ---- HTTP helpers ------------------------------------------------------------------------

class BodyTooLarge extends Error {}

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_BODY_BYTES) {
        reject(new BodyTooLarge());
        req.destroy();
        return;
      }
      chunks.push(chunk);
    });
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });
}

function header(req: http.IncomingMessage, name: string): string | undefined {
  const value = req.headers[name];
  return Array.isArray(value) ? value[0] : value;
}

function sendJson(res: http.ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}): void {
  const text = typeof body === 'string' ? body : JSON.stringify(body, null, 2);
  res.writeHead(status, {
    'content-type': 'application/json',
    'cache-control': 'no-cache, no-store',
    'content-length': Buffer.byteLength(text),
    ...headers,
  });
  res.end(text);
}

function sendHtml(res: http.ServerResponse, status: number, html: string, extraFormOrigins: string[] = []): void {
  const formAction = ["'self'", ...extraFormOrigins].join(' ');
  res.writeHead(status, {
    'content-type': 'text/html; charset=utf-8',
    'cache-control': 'no-store',
    'content-length': Buffer.byteLength(html),
    // form-action also governs where the post-submit redirect may go, hence the return URL's origin.
    'content-security-policy': `default-src 'none'; style-src 'unsafe-inline'; form-action ${formAction}; base-uri 'none'; frame-ancestors 'none'`,
    'referrer-policy': 'no-referrer',
    'x-content-type-options': 'nosniff',
  });
  res.end(html);
}

function apiKeyError(req: http.IncomingMessage): ApiError | null {
  const auth = header(req, 'authorization');
  if (!auth) {
    return new ApiError(401, {
      type: 'invalid_request_error',
      message: 'You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. \'Authorization: Bearer YOUR_SECRET_KEY\').',
    });
  }
  let key = '';
  const [scheme, value = ''] = auth.split(/\s+/, 2);
  if (scheme?.toLowerCase() === 'bearer') key = value;
  else if (scheme?.toLowerCase() === 'basic') key = Buffer.from(value, 'base64').toString('utf8').split(':')[0] ?? '';
  if (!key.startsWith('sk_test_') || key.length <= 'sk_test_'.length) {
    const shown = key.length > 8 ? `${key.slice(0, 8)}${'*'.repeat(Math.min(key.length - 12, 24))}${key.slice(-4)}` : key;
    return new ApiError(401, {
      type: 'invalid_request_error',
      message: `Invalid API Key provided: ${shown}. Cupel's local payments fake accepts test secret keys (sk_test_...) only.`,
      code: 'api_key_invalid',
    });
  }
  return null;
}

// ---- the fake ----------------------------------------------------------------------------

interface ApiContext {
  method: string;
  path: string;
  params: Params;
  account: string | null;
  requestId: string;
  idempotencyKey: string | null;
}

type ApiResult = { status: number; body: unknown };

export async function createPaymentsFake(options: PaymentsFakeOptions = {}): Promise<PaymentsFake> {
  const log = options.log ?? ((line: string) => console.log(line));
  const webhookSecret = options.webhookSecret ?? DEFAULT_WEBHOOK_SECRET;
  const payoutDelayMs = options.payoutDelayMs ?? DEFAULT_PAYOUT_DELAY_MS;
  const platformBalance = options.platformBalance ?? DEFAULT_PLATFORM_BALANCE;
  const retryBaseMs = options.webhookRetryBaseMs ?? 200;
  const maxAttempts = Math.max(1, options.webhookMaxAttempts ?? 6);
  const maxRetryDelayMs = options.webhookMaxRetryDelayMs ?? 30_000;
  const webhookTimeoutMs = options.webhookTimeoutMs ?? 5_000;
  const idempotencyTtlMs = options.idempotencyTtlMs ?? DAY_MS;
  let webhookUrl: string | null = null;
  const setWebhookUrl = (url: string | null) => {
    webhookUrl = url ? assertLoopbackUrl(url).toString() : null;
  };
  setWebhookUrl(options.webhookUrl ?? null);

  const stateFile = options.dataDir ? path.join(options.dataDir, 'payments', 'state.json') : null;
  const state: FakeState = (stateFile && loadState(stateFile)) || emptyState(platformBalance);
  const persistence = stateFile ? new StateFile(stateFile, () => state) : null;
  const changed = () => persistence?.schedule();

  let faults: Fault[] = [];
  let lastApiVersion: string | null = null;
  let closed = false;
  let abort = new AbortController();
  const timers = new Set<NodeJS.Timeout>();
  const later = (ms: number, fn: () => void) => {
    const timer = setTimeout(() => {
      timers.delete(timer);
      if (!closed) fn();
    }, Math.max(0, ms));
    timer.unref();
    timers.add(timer);
  };
  const clearTimers = () => {
    for (const timer of timers) clearTimeout(timer);
    timers.clear();
  };

  // -- faults --
  const addFault = (input: FaultInput): Fault => {
    const kinds: FaultKind[] = ['500', '409', '429', 'slow', 'timeout', 'decline-payout', 'delay-webhook', 'repeat-webhook'];
    if (!kinds.includes(input.next)) throw new Error(`"next" must be one of ${kinds.join(', ')}`);
    const count = input.count ?? 1;
    if (!Number.isInteger(count) || count < 1 || count > 1000) throw new Error('"count" must be a whole number from 1 to 1000');
    const fallbackDelay =
      input.next === 'timeout' ? DEFAULT_TIMEOUT_FAULT_MS : input.next === 'delay-webhook' ? DEFAULT_WEBHOOK_DELAY_MS : input.next === 'slow' ? 2_000 : 100;
    const delayMs = input.delayMs ?? fallbackDelay;
    if (!Number.isInteger(delayMs) || delayMs < 0 || delayMs > MAX_FAULT_DELAY_MS) throw new Error(`"delayMs" must be a whole number from 0 to ${MAX_FAULT_DELAY_MS}`);
    const fault: Fault = {
      id: newId('fault', 10),
      kind: input.next,
      remaining: count,
      delayMs,
      path: input.path ?? null,
      method: input.method ? input.method.toUpperCase() : null,
      process: input.process ?? true,
    };
    faults.push(fault);
    return fault;
  };
  const takeFault = (kinds: FaultKind[], request?: { method: string; path: string }): Fault | null => {
    const fault = faults.find(
      (f) =>
        kinds.includes(f.kind) &&
        (!request || ((!f.path || request.path.startsWith(f.path)) && (!f.method || f.method === request.method))),
    );
    if (!fault) return null;
    fault.remaining -= 1;
    if (fault.remaining <= 0) faults = faults.filter((f) => f !== fault);
    return { ...fault };
  };

  // -- events and webhooks --
  const findEvent = (id: string) => state.events.find((e) => e.id === id);
  const refreshPending = (eventId: string) => {
    const event = findEvent(eventId);
    if (!event) return;
    event.pending_webhooks = state.deliveries.filter((d) => d.event_id === eventId && !d.duplicate && d.status !== 'delivered').length;
  };

  const attemptDelivery = async (deliveryId: string): Promise<void> => {
    const delivery = state.deliveries.find((d) => d.id === deliveryId);
    if (!delivery || delivery.status !== 'pending') return;
    const event = findEvent(delivery.event_id);
    if (!event) return;
    const signal = abort.signal;
    const payload = JSON.stringify(event, null, 2);
    const at = Date.now();
    const result = await postWebhook(delivery.url, payload, webhookSecret, webhookTimeoutMs, signal);
    if (signal.aborted || closed) return;
    delivery.attempts.push({ at, ...result });
    const ok = result.status !== null && result.status >= 200 && result.status < 300;
    if (ok) {
      delivery.status = 'delivered';
      delivery.next_attempt_at = null;
    } else if (delivery.attempts.length >= maxAttempts) {
      delivery.status = 'failed';
      delivery.next_attempt_at = null;
      log(`[fake-payments] gave up delivering ${event.type} ${event.id} after ${delivery.attempts.length} attempts (last: ${result.status ?? result.error})`);
    } else {
      const delay = Math.min(retryBaseMs * 2 ** (delivery.attempts.length - 1), maxRetryDelayMs);
      delivery.next_attempt_at = Date.now() + delay;
      later(delay, () => void attemptDelivery(delivery.id));
    }
    refreshPending(event.id);
    changed();
  };

  const scheduleDelivery = (eventId: string, url: string, duplicate: boolean, delayMs: number) => {
    const delivery: DeliveryRecord = {
      id: newId('whdel', 16),
      event_id: eventId,
      url,
      duplicate,
      status: 'pending',
      attempts: [],
      next_attempt_at: Date.now() + delayMs,
    };
    state.deliveries.push(delivery);
    later(delayMs, () => void attemptDelivery(delivery.id));
  };

  const emit = (
    type: string,
    object: object,
    opts: { account?: string; previous?: Record<string, unknown>; ctx?: ApiContext } = {},
  ): Stripe.Event => {
    const event = {
      id: newId('evt'),
      object: 'event',
      ...(opts.account ? { account: opts.account } : {}),
      api_version: lastApiVersion,
      created: nowS(),
      data: { object: clone(object), ...(opts.previous ? { previous_attributes: clone(opts.previous) } : {}) },
      livemode: false,
      pending_webhooks: webhookUrl ? 1 : 0,
      request: opts.ctx ? { id: opts.ctx.requestId, idempotency_key: opts.ctx.idempotencyKey } : { id: null, idempotency_key: null },
      type,
    } as unknown as Stripe.Event;
    state.events.push(event);
    if (state.events.length > MAX_EVENTS) {
      const dropped = new Set(state.events.splice(0, state.events.length - MAX_EVENTS).map((e) => e.id));
      state.deliveries = state.deliveries.filter((d) => !dropped.has(d.event_id));
    }
    if (webhookUrl) {
      const delay = takeFault(['delay-webhook']);
      const repeat = takeFault(['repeat-webhook']);
      const first = delay ? delay.delayMs : 0;
      scheduleDelivery(event.id, webhookUrl, false, first);
      if (repeat) scheduleDelivery(event.id, webhookUrl, true, first + repeat.delayMs);
    }
    changed();
    return event;
  };

  // -- payouts --
  const settle = (id: string, status: 'paid' | 'failed'): Stripe.Payout => {
    const record = state.payouts[id];
    if (!record) throw missing('payout', id);
    const payout = record.payout;
    if (payout.status !== 'pending') throw invalid(`Payout ${id} is already ${payout.status}.`, 'status', 'status_transition_invalid');
    record.settle_at = null;
    if (status === 'paid') {
      payout.status = 'paid';
      payout.trace_id = { status: 'supported', value: `TRACE${id.slice(3, 15).toUpperCase()}` };
      emit('payout.paid', payout, { account: record.account, previous: { status: 'pending' } });
    } else {
      payout.status = 'failed';
      payout.failure_code = 'account_closed';
      payout.failure_message = 'The bank account has been closed.';
      payout.failure_balance_transaction = newId('txn');
      const balance = state.accounts[record.account]?.balance;
      if (balance) balance[payout.currency] = (balance[payout.currency] ?? 0) + payout.amount;
      emit('payout.failed', payout, { account: record.account, previous: { status: 'pending', failure_code: null, failure_message: null } });
    }
    changed();
    return clone(payout);
  };
  const scheduleSettlement = (record: PayoutRecord) => {
    if (record.settle_at === null) return;
    later(record.settle_at - Date.now(), () => {
      if (state.payouts[record.payout.id]?.payout.status === 'pending') settle(record.payout.id, record.outcome);
    });
  };

  const resume = () => {
    for (const record of Object.values(state.payouts)) {
      if (record.payout.status === 'pending') scheduleSettlement(record);
    }
    for (const delivery of state.deliveries) {
      if (delivery.status === 'pending') later((delivery.next_attempt_at ?? Date.now()) - Date.now(), () => void attemptDelivery(delivery.id));
    }
  };

  // -- resources --
  const accountRecord = (id: string, param = 'id'): AccountRecord => {
    const record = state.accounts[id];
    if (!record) throw missing('account', id, param);
    return record;
  };
  const connectedAccount = (ctx: ApiContext): AccountRecord | null => {
    if (!ctx.account) return null;
    const record = state.accounts[ctx.account];
    if (!record) {
      throw new ApiError(403, {
        type: 'invalid_request_error',
        code: 'account_invalid',
        message: `The provided key does not have access to account '${ctx.account}' (or that account does not exist). Application access may have been revoked.`,
      });
    }
    return record;
  };
  const balanceBody = (balances: Balances, instant: boolean): Stripe.Balance => {
    const currencies = Object.keys(balances).length ? Object.keys(balances) : ['usd'];
    const available = currencies.map((currency) => ({ amount: balances[currency] ?? 0, currency, source_types: { card: balances[currency] ?? 0 } }));
    return {
      object: 'balance',
      available,
      ...(instant ? { instant_available: clone(available) } : {}),
      livemode: false,
      pending: currencies.map((currency) => ({ amount: 0, currency, source_types: { card: 0 } })),
    };
  };

  const createAccount = (ctx: ApiContext): ApiResult => {
    const p = ctx.params;
    allowOnly(p, ['type', 'country', 'email', 'capabilities', 'business_type', 'business_profile', 'default_currency', 'metadata', 'expand']);
    const type = readString(p, 'type') ?? 'custom';
    if (!['custom', 'express', 'standard'].includes(type)) throw invalid(`Invalid type: must be one of custom, express, or standard`, 'type');
    const country = (readString(p, 'country') ?? 'US').toUpperCase();
    if (!/^[A-Z]{2}$/.test(country)) throw invalid(`Country '${country}' is unknown. Try using a 2-character alphanumeric country code instead, such as 'US'.`, 'country', 'country_unsupported');
    const email = readString(p, 'email');
    if (email !== undefined && !/^[^\s@]+@[^\s@]+$/.test(email)) throw invalid('Invalid email address: ' + email, 'email', 'email_invalid');
    const businessType = readString(p, 'business_type');
    if (businessType !== undefined && !['individual', 'company', 'non_profit', 'government_entity'].includes(businessType)) {
      throw invalid('Invalid business_type: must be one of company, government_entity, individual, or non_profit', 'business_type');
    }
    const defaultCurrency = (readString(p, 'default_currency') ?? 'usd').toLowerCase();
    if (!CURRENCIES.has(defaultCurrency)) throw invalid(`Invalid currency: ${defaultCurrency}. This local payments fake supports usd only.`, 'default_currency');
    const capabilities: Record<string, string> = {};
    const rawCaps = p.capabilities;
    if (rawCaps !== undefined) {
      if (typeof rawCaps !== 'object' || Array.isArray(rawCaps)) throw invalid('Invalid object', 'capabilities');
      for (const [name, value] of Object.entries(rawCaps)) {
        if (typeof value !== 'object' || Array.isArray(value) || (value.requested !== 'true' && value.requested !== 'false')) {
          throw invalid(`Invalid capabilities[${name}]: expected requested=true or false.`, `capabilities[${name}]`);
        }
        if (value.requested === 'true') capabilities[name] = 'inactive';
      }
    }
    const id = newId('acct', 16);
    const account: Stripe.Account = {
      id,
      object: 'account',
      business_profile: businessProfile(p.business_profile, null),
      business_type: businessType ?? null,
      capabilities,
      charges_enabled: false,
      country,
      created: nowS(),
      default_currency: defaultCurrency,
      details_submitted: false,
      email: email ?? null,
      external_accounts: { object: 'list', data: [], has_more: false, url: `/v1/accounts/${id}/external_accounts` },
      metadata: applyMetadata({}, p.metadata),
      payouts_enabled: false,
      requirements: {
        alternatives: [],
        current_deadline: null,
        currently_due: [...ACCOUNT_REQUIREMENTS],
        disabled_reason: 'requirements.past_due',
        errors: [],
        eventually_due: [...ACCOUNT_REQUIREMENTS],
        past_due: [...ACCOUNT_REQUIREMENTS],
        pending_verification: [],
      },
      settings: null,
      type,
    };
    state.accounts[id] = { account, balance: { usd: 0 } };
    changed();
    return { status: 200, body: account };
  };

  const updateAccount = (ctx: ApiContext, id: string): ApiResult => {
    const p = ctx.params;
    allowOnly(p, ['email', 'metadata', 'business_profile', 'expand']);
    const record = accountRecord(id);
    const account = record.account;
    const previous: Record<string, unknown> = {};
    const email = readString(p, 'email');
    if (email !== undefined) {
      if (email !== '' && !/^[^\s@]+@[^\s@]+$/.test(email)) throw invalid('Invalid email address: ' + email, 'email', 'email_invalid');
      const next = email === '' ? null : email;
      if (next !== account.email) {
        previous.email = account.email;
        account.email = next;
      }
    }
    if (p.metadata !== undefined) {
      const next = applyMetadata(account.metadata ?? {}, p.metadata);
      if (canonical(next) !== canonical(account.metadata ?? {})) {
        previous.metadata = account.metadata ?? {};
        account.metadata = next;
      }
    }
    if (p.business_profile !== undefined) {
      const next = businessProfile(p.business_profile, account.business_profile ?? null);
      previous.business_profile = account.business_profile ?? null;
      account.business_profile = next;
    }
    if (Object.keys(previous).length) emit('account.updated', account, { account: id, previous, ctx });
    changed();
    return { status: 200, body: account };
  };

  const createLink = (ctx: ApiContext): ApiResult => {
    const p = ctx.params;
    allowOnly(p, ['account', 'type', 'refresh_url', 'return_url', 'expand']);
    const accountId = readString(p, 'account', true);
    const type = readString(p, 'type', true);
    if (!['account_onboarding', 'account_update'].includes(type)) throw invalid('Invalid type: must be one of account_onboarding or account_update', 'type');
    const refreshUrl = readUrl(p, 'refresh_url');
    const returnUrl = readUrl(p, 'return_url');
    if (!state.accounts[accountId]) throw invalid(`No such account: '${accountId}'`, 'account', 'resource_missing');
    const created = nowS();
    const token = randomBytes(18).toString('base64url');
    const link: LinkRecord = { token, account: accountId, type, refresh_url: refreshUrl, return_url: returnUrl, created, expires_at: created + LINK_LIFETIME_S, used_at: null };
    state.links[token] = link;
    changed();
    const body: Stripe.AccountLink = { object: 'account_link', created, expires_at: link.expires_at, url: `${publicUrl()}/onboard/${token}` };
    return { status: 200, body };
  };

  const createTransfer = (ctx: ApiContext): ApiResult => {
    const p = ctx.params;
    if (ctx.account) throw invalid('Transfers go from the platform: send this request without the Stripe-Account header.', undefined, 'platform_account_required');
    allowOnly(p, ['amount', 'currency', 'destination', 'metadata', 'transfer_group', 'description', 'expand']);
    const amount = readAmount(p);
    const currency = readCurrency(p);
    const destination = readString(p, 'destination', true);
    const metadata = applyMetadata({}, p.metadata);
    const transferGroup = readString(p, 'transfer_group') ?? null;
    const description = readString(p, 'description') ?? null;
    const target = state.accounts[destination];
    if (!target) throw invalid(`No such destination: '${destination}'`, 'destination', 'resource_missing');
    if (!target.account.payouts_enabled || target.account.capabilities?.transfers === 'inactive') {
      throw businessError(
        `The destination account ${destination} has not finished onboarding, so it cannot receive transfers yet (its transfers capability is not active).`,
        'account_invalid',
        'destination',
      );
    }
    const available = state.platform_balance[currency] ?? 0;
    if (available < amount) {
      throw businessError(
        `You have insufficient available funds in your account (${available} ${currency} available, ${amount} requested).`,
        'balance_insufficient',
      );
    }
    state.platform_balance[currency] = available - amount;
    target.balance[currency] = (target.balance[currency] ?? 0) + amount;
    const id = newId('tr');
    const transfer: Stripe.Transfer = {
      id,
      object: 'transfer',
      amount,
      amount_reversed: 0,
      balance_transaction: newId('txn'),
      created: nowS(),
      currency,
      description,
      destination,
      destination_payment: newId('py'),
      livemode: false,
      metadata,
      reversals: { object: 'list', data: [], has_more: false, url: `/v1/transfers/${id}/reversals` },
      reversed: false,
      source_transaction: null,
      source_type: 'card',
      transfer_group: transferGroup,
    };
    state.transfers[id] = transfer;
    emit('transfer.created', transfer, { ctx });
    return { status: 200, body: transfer };
  };

  /**
   * Takes a transfer back from the connected account to the platform. As with the provider for
   * accounts whose losses the platform carries, the connected balance may go below zero when the
   * money was already paid out; the provider then recovers it from the account (from memory).
   */
  const createReversal = (ctx: ApiContext, transferId: string): ApiResult => {
    const p = ctx.params;
    if (ctx.account) throw invalid('Transfer reversals are made by the platform: send this request without the Stripe-Account header.', undefined, 'platform_account_required');
    allowOnly(p, ['amount', 'metadata', 'description', 'refund_application_fee', 'expand']);
    const transfer = state.transfers[transferId];
    if (!transfer) throw missing('transfer', transferId);
    const left = transfer.amount - transfer.amount_reversed;
    const amount = p.amount === undefined ? left : readAmount(p);
    if (amount > left) {
      throw businessError(`Transfer ${transferId} has ${left} ${transfer.currency} left to reverse; ${amount} requested.`, 'transfer_reversal_exceeds_transfer', 'amount');
    }
    const target = state.accounts[transfer.destination as string];
    if (target) target.balance[transfer.currency] = (target.balance[transfer.currency] ?? 0) - amount;
    state.platform_balance[transfer.currency] = (state.platform_balance[transfer.currency] ?? 0) + amount;
    const reversal: Stripe.TransferReversal = {
      id: newId('trr'),
      object: 'transfer_reversal',
      amount,
      balance_transaction: newId('txn'),
      created: nowS(),
      currency: transfer.currency,
      destination_payment_refund: newId('pyr'),
      metadata: applyMetadata({}, p.metadata),
      source_refund: null,
      transfer: transfer.id,
    };
    transfer.amount_reversed += amount;
    transfer.reversed = transfer.amount_reversed >= transfer.amount;
    transfer.reversals.data.unshift(reversal);
    emit('transfer.reversed', transfer, { ctx, previous: { amount_reversed: transfer.amount_reversed - amount } });
    return { status: 200, body: reversal };
  };

  const createPayout = (ctx: ApiContext): ApiResult => {
    const p = ctx.params;
    allowOnly(p, ['amount', 'currency', 'method', 'destination', 'metadata', 'description', 'statement_descriptor', 'source_type', 'expand']);
    const record = connectedAccount(ctx);
    if (!record) {
      throw invalid(
        "Cupel's local payments fake pays out from connected accounts only: send the Stripe-Account header (the SDK's stripeAccount option).",
        undefined,
        'parameter_missing',
      );
    }
    const amount = readAmount(p);
    const currency = readCurrency(p);
    const method = readString(p, 'method') ?? 'standard';
    if (method !== 'standard' && method !== 'instant') throw invalid('Invalid method: must be one of standard or instant', 'method');
    const sourceType = readString(p, 'source_type') ?? 'card';
    if (sourceType !== 'card') throw invalid('Invalid source_type: this fake keeps card balances only', 'source_type');
    const metadata = applyMetadata({}, p.metadata);
    const description = readString(p, 'description') ?? null;
    const statementDescriptor = readString(p, 'statement_descriptor') ?? null;
    const account = record.account;
    if (!account.payouts_enabled) {
      throw businessError(`Payouts are not enabled for account ${account.id}: it has not finished onboarding.`, 'payouts_not_allowed');
    }
    const externals = account.external_accounts?.data ?? [];
    const wanted = readString(p, 'destination');
    const external = wanted ? externals.find((e) => e.id === wanted) : (externals.find((e) => e.default_for_currency) ?? externals[0]);
    if (!external) {
      if (wanted) throw invalid(`No such external account: '${wanted}'`, 'destination', 'resource_missing');
      throw businessError('This account has no external account to pay out to.', 'no_external_account');
    }
    if (method === 'instant' && !(external.available_payout_methods ?? []).includes('instant')) {
      throw businessError(`Instant payouts are not supported for ${external.id}: use method=standard.`, 'instant_payouts_unsupported', 'method');
    }
    const available = record.balance[currency] ?? 0;
    if (available < amount) {
      throw businessError(
        `You have insufficient funds in your account for this payout (${available} ${currency} available, ${amount} requested).`,
        'balance_insufficient',
        'amount',
      );
    }
    record.balance[currency] = available - amount;
    const created = nowS();
    const decline = takeFault(['decline-payout']);
    const payout: Stripe.Payout = {
      id: newId('po'),
      object: 'payout',
      amount,
      application_fee: null,
      application_fee_amount: null,
      arrival_date: method === 'instant' ? created : created + 2 * 86_400,
      automatic: false,
      balance_transaction: newId('txn'),
      created,
      currency,
      description,
      destination: external.id,
      failure_balance_transaction: null,
      failure_code: null,
      failure_message: null,
      livemode: false,
      metadata,
      method,
      original_payout: null,
      payout_method: null,
      reconciliation_status: 'not_applicable',
      reversed_by: null,
      source_type: sourceType,
      statement_descriptor: statementDescriptor,
      status: 'pending',
      trace_id: { status: 'pending', value: null },
      type: external.object === 'card' ? 'card' : 'bank_account',
    };
    const payoutRecord: PayoutRecord = {
      account: account.id,
      payout,
      settle_at: Date.now() + payoutDelayMs,
      outcome: decline ? 'failed' : 'paid',
    };
    state.payouts[payout.id] = payoutRecord;
    emit('payout.created', payout, { account: account.id, ctx });
    scheduleSettlement(payoutRecord);
    return { status: 200, body: payout };
  };

  const payoutsOf = (ctx: ApiContext) =>
    Object.values(state.payouts)
      .filter((r) => r.account === ctx.account)
      .map((r) => r.payout)
      .sort((a, b) => b.created - a.created);

  const eventsOf = (ctx: ApiContext) => state.events.filter((e) => (e.account ?? null) === ctx.account).reverse();

  const routes: Array<{ method: string; pattern: RegExp; handle: (ctx: ApiContext, id: string) => ApiResult }> = [
    { method: 'POST', pattern: /^\/v1\/accounts$/, handle: createAccount },
    {
      method: 'GET',
      pattern: /^\/v1\/accounts$/,
      handle: (ctx) => ({
        status: 200,
        body: listOf(Object.values(state.accounts).map((r) => r.account).reverse(), ctx.params, '/v1/accounts'),
      }),
    },
    { method: 'GET', pattern: /^\/v1\/accounts\/([^/]+)$/, handle: (_ctx, id) => ({ status: 200, body: accountRecord(id).account }) },
    { method: 'POST', pattern: /^\/v1\/accounts\/([^/]+)$/, handle: updateAccount },
    { method: 'POST', pattern: /^\/v1\/account_links$/, handle: createLink },
    { method: 'POST', pattern: /^\/v1\/transfers$/, handle: createTransfer },
    {
      method: 'GET',
      pattern: /^\/v1\/transfers$/,
      handle: (ctx) => ({ status: 200, body: listOf(Object.values(state.transfers).reverse(), ctx.params, '/v1/transfers') }),
    },
    {
      method: 'GET',
      pattern: /^\/v1\/transfers\/([^/]+)$/,
      handle: (_ctx, id) => {
        const transfer = state.transfers[id];
        if (!transfer) throw missing('transfer', id);
        return { status: 200, body: transfer };
      },
    },
    { method: 'POST', pattern: /^\/v1\/transfers\/([^/]+)\/reversals$/, handle: createReversal },
    {
      method: 'GET',
      pattern: /^\/v1\/transfers\/([^/]+)\/reversals$/,
      handle: (ctx, id) => {
        const transfer = state.transfers[id];
        if (!transfer) throw missing('transfer', id);
        return { status: 200, body: listOf(transfer.reversals.data, ctx.params, `/v1/transfers/${id}/reversals`) };
      },
    },
    { method: 'POST', pattern: /^\/v1\/payouts$/, handle: createPayout },
    {
      method: 'GET',
      pattern: /^\/v1\/payouts$/,
      handle: (ctx) => {
        connectedAccount(ctx);
        const status = readString(ctx.params, 'status');
        const payouts = payoutsOf(ctx).filter((po) => !status || po.status === status);
        return { status: 200, body: listOf(payouts, ctx.params, '/v1/payouts') };
      },
    },
    {
      method: 'GET',
      pattern: /^\/v1\/payouts\/([^/]+)$/,
      handle: (ctx, id) => {
        connectedAccount(ctx);
        const record = state.payouts[id];
        if (!record || record.account !== ctx.account) throw missing('payout', id);
        return { status: 200, body: record.payout };
      },
    },
    {
      method: 'GET',
      pattern: /^\/v1\/balance$/,
      handle: (ctx) => {
        const record = connectedAccount(ctx);
        if (!record) return { status: 200, body: balanceBody(state.platform_balance, false) };
        const instant = (record.account.external_accounts?.data ?? []).some((e) => (e.available_payout_methods ?? []).includes('instant'));
        return { status: 200, body: balanceBody(record.balance, instant) };
      },
    },
    {
      method: 'GET',
      pattern: /^\/v1\/events$/,
      handle: (ctx) => {
        connectedAccount(ctx);
        const type = readString(ctx.params, 'type');
        const matches = (t: string) => !type || (type.endsWith('.*') ? t.startsWith(type.slice(0, -1)) : t === type);
        return { status: 200, body: listOf(eventsOf(ctx).filter((e) => matches(e.type)), ctx.params, '/v1/events') };
      },
    },
    {
      method: 'GET',
      pattern: /^\/v1\/events\/([^/]+)$/,
      handle: (ctx, id) => {
        connectedAccount(ctx);
        const event = findEvent(id);
        if (!event || (event.account ?? null) !== ctx.account) throw missing('event', id);
        return { status: 200, body: event };
      },
    },
  ];

  // -- onboarding --
  let boundPort = 0;
  const publicUrl = () => (options.publicUrl ?? `http://127.0.0.1:${boundPort}`).replace(/\/+$/, '');

  const completeOnboarding = (link: LinkRecord, submission: Submission) => {
    const record = accountRecord(link.account);
    const account = record.account;
    const previous: Record<string, unknown> = {
      capabilities: clone(account.capabilities ?? {}),
      charges_enabled: account.charges_enabled,
      details_submitted: account.details_submitted,
      payouts_enabled: account.payouts_enabled,
      requirements: clone(account.requirements),
    };
    const list = account.external_accounts ?? { object: 'list' as const, data: [], has_more: false, url: `/v1/accounts/${account.id}/external_accounts` };
    for (const existing of list.data) existing.default_for_currency = false;
    const fingerprint = (text: string) => createHash('sha256').update(text).digest('base64url').slice(0, 16);
    let external: Stripe.Card | Stripe.BankAccount;
    if (submission.method === 'card') {
      const first = submission.number[0];
      external = {
        id: newId('card'),
        object: 'card',
        account: account.id,
        address_city: null,
        address_country: null,
        address_line1: null,
        address_line1_check: null,
        address_line2: null,
        address_state: null,
        address_zip: null,
        address_zip_check: null,
        available_payout_methods: ['standard', 'instant'],
        brand: first === '4' ? 'Visa' : first === '5' || first === '2' ? 'MasterCard' : 'Unknown',
        country: 'US',
        currency: 'usd',
        cvc_check: null,
        default_for_currency: true,
        dynamic_last4: null,
        exp_month: submission.exp_month,
        exp_year: submission.exp_year,
        fingerprint: fingerprint(submission.number),
        funding: 'debit',
        last4: submission.number.slice(-4),
        metadata: {},
        name: submission.name,
        regulated_status: 'unregulated',
        status: null,
        tokenization_method: null,
      };
    } else {
      external = {
        id: newId('ba'),
        object: 'bank_account',
        account: account.id,
        account_holder_name: submission.account_holder_name,
        account_holder_type: 'individual',
        account_type: 'checking',
        available_payout_methods: ['standard'],
        bank_name: 'TEST BANK',
        country: 'US',
        currency: 'usd',
        default_for_currency: true,
        fingerprint: fingerprint(`${submission.routing_number}:${submission.account_number}`),
        last4: submission.account_number.slice(-4),
        metadata: {},
        routing_number: submission.routing_number,
        status: 'new',
      };
    }
    list.data.unshift(external);
    account.external_accounts = list;
    const capabilities: Record<string, string> = { ...(account.capabilities ?? {}) };
    for (const name of Object.keys(capabilities)) capabilities[name] = 'active';
    if (!capabilities.transfers) capabilities.transfers = 'active';
    account.capabilities = capabilities;
    account.charges_enabled = true;
    account.details_submitted = true;
    account.payouts_enabled = true;
    account.requirements = {
      alternatives: [],
      current_deadline: null,
      currently_due: [],
      disabled_reason: null,
      errors: [],
      eventually_due: [],
      past_due: [],
      pending_verification: [],
    };
    link.used_at = nowS();
    emit('account.updated', account, { account: account.id, previous });
  };

  const handleOnboarding = async (req: http.IncomingMessage, res: http.ServerResponse, token: string) => {
    const link = state.links[token];
    if (!link) {
      sendHtml(res, 404, renderMessagePage('Link not found', 'This setup link is not known to the local payments fake. Ask Cupel for a new link.'));
      return;
    }
    if (link.used_at !== null || link.expires_at < nowS()) {
      // The provider sends a used or expired link back to refresh_url, where the platform makes a new one.
      if (link.refresh_url) {
        res.writeHead(303, { location: link.refresh_url, 'cache-control': 'no-store' });
        res.end();
      } else {
        sendHtml(res, 410, renderMessagePage('Link expired', 'This setup link has expired or was already used. Ask Cupel for a new link.'));
      }
      return;
    }
    const record = state.accounts[link.account];
    if (!record) {
      sendHtml(res, 404, renderMessagePage('Account not found', 'The account this link was made for no longer exists.'));
      return;
    }
    const returnOrigin = new URL(link.return_url).origin;
    if (req.method === 'GET' || req.method === 'HEAD') {
      sendHtml(res, 200, renderOnboardingPage({ token, accountId: record.account.id, email: record.account.email, values: defaultValues(), errors: {} }), [returnOrigin]);
      return;
    }
    if (req.method !== 'POST') {
      res.writeHead(405, { allow: 'GET, POST' });
      res.end();
      return;
    }
    const values = valuesFromForm(new URLSearchParams(await readBody(req)));
    const outcome = validate(values);
    if ('errors' in outcome) {
      sendHtml(res, 400, renderOnboardingPage({ token, accountId: record.account.id, email: record.account.email, values, errors: outcome.errors }), [returnOrigin]);
      return;
    }
    completeOnboarding(link, outcome.submission);
    res.writeHead(303, { location: link.return_url, 'cache-control': 'no-store' });
    res.end();
  };

  // -- API dispatch --
  const replayOrError = (key: string, fingerprint: string): IdempotencyRecord | ApiError | null => {
    const stored = state.idempotency[key];
    if (!stored) return null;
    if (Date.now() - stored.created_ms > idempotencyTtlMs) {
      delete state.idempotency[key];
      return null;
    }
    if (stored.fingerprint !== fingerprint) {
      return new ApiError(400, {
        type: 'idempotency_error',
        message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
      });
    }
    return stored;
  };
  const remember = (key: string, record: IdempotencyRecord) => {
    const cutoff = Date.now() - idempotencyTtlMs;
    for (const [k, v] of Object.entries(state.idempotency)) if (v.created_ms < cutoff) delete state.idempotency[k];
    state.idempotency[key] = record;
    changed();
  };

  // Keys of requests being carried out right now: another request with the same key meanwhile
  // answers 409 idempotency_key_in_use, as the provider does, and is not remembered.
  const inFlight = new Set<string>();
  const keyInUse = (key: string) =>
    new ApiError(409, {
      type: 'idempotency_error',
      code: 'idempotency_key_in_use',
      message: `There is currently another in-progress request using this idempotency key (that probably means you submitted twice, and the other request is still going through): ${key}. Please try again later.`,
    });
  const pause = (ms: number) =>
    new Promise<void>((resolve) => {
      const timer = setTimeout(resolve, ms);
      timer.unref();
      timers.add(timer);
    });

  const dropAfter = (req: http.IncomingMessage, ms: number) => {
    later(ms, () => req.socket.destroy());
  };

  const handleApi = async (req: http.IncomingMessage, res: http.ServerResponse, url: URL) => {
    const method = (req.method ?? 'GET').toUpperCase();
    const requestId = newId('req', 14);
    const body = await readBody(req);
    const version = header(req, 'stripe-version');
    if (version) lastApiVersion = version;
    const idempotencyKey = method === 'POST' ? (header(req, 'idempotency-key') ?? null) : null;
    const baseHeaders: Record<string, string> = { 'request-id': requestId };
    if (version) baseHeaders['stripe-version'] = version;
    if (idempotencyKey) baseHeaders['idempotency-key'] = idempotencyKey;
    const fail = (err: ApiError, extra: Record<string, string> = {}) => sendJson(res, err.status, { error: err.error }, { ...baseHeaders, ...extra });

    const authError = apiKeyError(req);
    if (authError) return fail(authError, { 'www-authenticate': 'Bearer realm="Cupel local payments fake"' });

    const fault = takeFault(['500', '409', '429', 'slow', 'timeout'], { method, path: url.pathname });
    if (fault?.kind === '500') {
      return fail(new ApiError(500, { type: 'api_error', message: "An unknown error occurred (injected by Cupel's local payments fake fault switch)." }));
    }
    if (fault?.kind === '409') return fail(keyInUse(idempotencyKey ?? '(none)'));
    if (fault?.kind === '429') {
      return fail(
        new ApiError(429, {
          type: 'invalid_request_error',
          code: 'rate_limit',
          message: "Too many requests hit the API too quickly (injected by Cupel's local payments fake fault switch).",
        }),
      );
    }
    if (fault?.kind === 'timeout' && !fault.process) return dropAfter(req, fault.delayMs);

    const route = routes.find((r) => r.method === method && r.pattern.test(url.pathname));
    const respond = (status: number, text: string, extra: Record<string, string> = {}) => {
      if (fault?.kind === 'timeout') return dropAfter(req, fault.delayMs);
      sendJson(res, status, text, { ...baseHeaders, ...extra });
    };
    if (!route) {
      const err = invalid(`Unrecognized request URL (${method}: ${url.pathname}).`, undefined, undefined, 404);
      return respond(404, JSON.stringify({ error: err.error }, null, 2));
    }
    const account = header(req, 'stripe-account') ?? header(req, 'stripe-context') ?? null;
    let params: Params;
    try {
      const raw = method === 'POST' ? body : url.search.slice(1);
      const contentType = header(req, 'content-type') ?? '';
      if (method === 'POST' && raw && !contentType.startsWith('application/x-www-form-urlencoded')) {
        throw invalid('Request bodies must be application/x-www-form-urlencoded, as the SDK sends them.');
      }
      params = parseForm(raw);
    } catch (err) {
      const apiErr = err instanceof ApiError ? err : invalid((err as Error).message, err instanceof FormError ? err.param : undefined);
      return respond(apiErr.status, JSON.stringify({ error: apiErr.error }, null, 2));
    }
    if (idempotencyKey !== null && idempotencyKey.length > 255) {
      const err = invalid('Idempotency keys may be at most 255 characters long.', undefined, undefined);
      return respond(400, JSON.stringify({ error: err.error }, null, 2));
    }
    const fingerprint = `${method} ${url.pathname} ${account ?? '-'} ${canonical(params)}`;
    if (idempotencyKey) {
      const previous = replayOrError(idempotencyKey, fingerprint);
      if (previous instanceof ApiError) return respond(previous.status, JSON.stringify({ error: previous.error }, null, 2));
      if (previous) return respond(previous.status, previous.body, { 'idempotent-replayed': 'true', 'original-request': previous.request_id });
      if (inFlight.has(idempotencyKey)) {
        const err = keyInUse(idempotencyKey);
        return respond(err.status, JSON.stringify({ error: err.error }, null, 2));
      }
    }
    if (fault?.kind === 'slow') {
      // Held before it is carried out, the way a slow provider request is: its key is in use meanwhile.
      if (idempotencyKey) inFlight.add(idempotencyKey);
      try {
        await pause(fault.delayMs);
      } finally {
        if (idempotencyKey) inFlight.delete(idempotencyKey);
      }
      if (closed) return;
      if (idempotencyKey) {
        const previous = replayOrError(idempotencyKey, fingerprint);
        if (previous instanceof ApiError) return respond(previous.status, JSON.stringify({ error: previous.error }, null, 2));
        if (previous) return respond(previous.status, previous.body, { 'idempotent-replayed': 'true', 'original-request': previous.request_id });
      }
    }
    const ctx: ApiContext = { method, path: url.pathname, params, account, requestId, idempotencyKey };
    let status: number;
    let text: string;
    let storable: boolean;
    try {
      const id = decodeURIComponent(route.pattern.exec(url.pathname)?.[1] ?? '');
      const result = route.handle(ctx, id);
      status = result.status;
      text = JSON.stringify(result.body, null, 2);
      storable = true;
    } catch (err) {
      if (!(err instanceof ApiError)) throw err;
      status = err.status;
      text = JSON.stringify({ error: err.error }, null, 2);
      storable = err.storable;
    }
    if (idempotencyKey && storable && status < 500) {
      remember(idempotencyKey, { fingerprint, status, body: text, request_id: requestId, created_ms: Date.now() });
    }
    respond(status, text);
  };

  // -- admin --
  const stateView = () => ({
    webhook_url: webhookUrl,
    platform_balance: state.platform_balance,
    accounts: Object.values(state.accounts),
    links: Object.values(state.links),
    transfers: Object.values(state.transfers),
    payouts: Object.values(state.payouts),
    events: state.events,
    deliveries: state.deliveries,
    faults,
    idempotency_keys: Object.keys(state.idempotency).length,
  });

  const reset = () => {
    abort.abort();
    abort = new AbortController();
    clearTimers();
    Object.assign(state, emptyState(platformBalance));
    faults = [];
    changed();
  };

  const handleAdmin = async (req: http.IncomingMessage, res: http.ServerResponse, url: URL) => {
    const method = (req.method ?? 'GET').toUpperCase();
    // A web page in a browser must not be able to drive the switch; scripts and tests send no such headers.
    const site = header(req, 'sec-fetch-site');
    const origin = header(req, 'origin');
    if ((site && site !== 'same-origin' && site !== 'none') || (origin && origin !== new URL(publicUrl()).origin && origin !== `http://127.0.0.1:${boundPort}`)) {
      return sendJson(res, 403, { error: { type: 'invalid_request_error', message: 'Admin routes are not for browsers.' } });
    }
    const text = await readBody(req);
    let json: Record<string, unknown> = {};
    if (text.trim()) {
      try {
        json = JSON.parse(text) as Record<string, unknown>;
      } catch {
        return sendJson(res, 400, { error: { type: 'invalid_request_error', message: 'Body must be JSON.' } });
      }
    }
    const p = url.pathname;
    try {
      if (method === 'GET' && p === '/_fake/health') return sendJson(res, 200, { ok: true, service: 'payments-fake', webhook_url: webhookUrl });
      if (method === 'GET' && p === '/_fake/state') return sendJson(res, 200, stateView());
      if (method === 'POST' && p === '/_fake/reset') {
        reset();
        return sendJson(res, 200, { ok: true });
      }
      if (method === 'GET' && p === '/_fake/faults') return sendJson(res, 200, { faults });
      if (method === 'DELETE' && p === '/_fake/faults') {
        faults = [];
        return sendJson(res, 200, { faults });
      }
      if (method === 'POST' && p === '/_fake/faults') return sendJson(res, 200, { fault: addFault(json as unknown as FaultInput), faults });
      if (method === 'POST' && p === '/_fake/config') {
        if ('webhookUrl' in json) setWebhookUrl((json.webhookUrl as string | null) || null);
        return sendJson(res, 200, { webhook_url: webhookUrl });
      }
      const settleMatch = /^\/_fake\/payouts\/([^/]+)\/settle$/.exec(p);
      if (method === 'POST' && settleMatch) {
        const status = url.searchParams.get('status') ?? (json.status as string | undefined) ?? 'paid';
        if (status !== 'paid' && status !== 'failed') throw new Error('status must be paid or failed');
        return sendJson(res, 200, settle(decodeURIComponent(settleMatch[1] ?? ''), status));
      }
    } catch (err) {
      if (err instanceof ApiError) return sendJson(res, err.status, { error: err.error });
      return sendJson(res, 400, { error: { type: 'invalid_request_error', message: (err as Error).message } });
    }
    return sendJson(res, 404, { error: { type: 'invalid_request_error', message: `Unknown admin route ${method} ${p}` } });
  };

  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    const route = url.pathname;
    const work = route.startsWith('/v1/')
      ? handleApi(req, res, url)
      : route.startsWith('/_fake/')
        ? handleAdmin(req, res, url)
        : route.startsWith('/onboard/')
          ? handleOnboarding(req, res, decodeURIComponent(route.slice('/onboard/'.length)))
          : Promise.resolve(
              route === '/'
                ? sendHtml(res, 200, renderMessagePage(PAGE_TITLE, "Cupel's local payments fake is running. Cupel talks to it through the payment provider's SDK."))
                : sendJson(res, 404, { error: { type: 'invalid_request_error', message: `Unrecognized request URL (${req.method}: ${route}).` } }),
            );
    work.catch((err: unknown) => {
      if (err instanceof BodyTooLarge) {
        if (!res.headersSent) sendJson(res, 413, { error: { type: 'invalid_request_error', message: 'Request body too large.' } });
        return;
      }
      log(`[fake-payments] internal error on ${req.method} ${route}: ${(err as Error).stack ?? String(err)}`);
      if (!res.headersSent) sendJson(res, 500, { error: { type: 'api_error', message: 'Internal error in the local payments fake.' } });
      else res.destroy();
    });
  });
  server.keepAliveTimeout = 5_000;
  server.requestTimeout = 30_000;

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? DEFAULT_PORT, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  boundPort = (server.address() as AddressInfo).port;
  resume();

  return {
    server,
    url: `http://127.0.0.1:${boundPort}`,
    port: boundPort,
    webhookSecret,
    get state() {
      return state;
    },
    get faults() {
      return faults;
    },
    get webhookUrl() {
      return webhookUrl;
    },
    setWebhookUrl,
    addFault,
    clearFaults: () => {
      faults = [];
    },
    settlePayout: settle,
    reset,
    flush: () => persistence?.writeNow(),
    close: async () => {
      if (closed) return;
      closed = true;
      abort.abort();
      clearTimers();
      persistence?.writeNow();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
  };
}

export type { FakeState } from './state.js';

function businessProfile(value: Param | undefined, existing: Stripe.Account.BusinessProfile | null): Stripe.Account.BusinessProfile | null {
  if (value === undefined) return existing;
  if (value === '') return null;
  if (typeof value !== 'object' || Array.isArray(value)) throw invalid('Invalid object', 'business_profile');
  const allowed = ['name', 'url', 'mcc', 'product_description', 'support_email', 'support_phone', 'support_url'];
  for (const [key, v] of Object.entries(value)) {
    if (!allowed.includes(key)) throw invalid(`Received unknown parameter: business_profile[${key}]`, `business_profile[${key}]`, 'parameter_unknown');
    if (typeof v !== 'string') throw invalid(`Invalid string: business_profile[${key}]`, `business_profile[${key}]`);
  }
  const get = (key: string) => {
    const v = (value as Record<string, Param>)[key];
    return typeof v === 'string' ? v || null : undefined;
  };
  const base = existing ?? {
    mcc: null,
    minority_owned_business_designation: null,
    name: null,
    product_description: null,
    specified_commercial_transactions_act_url: null,
    support_address: null,
    support_email: null,
    support_phone: null,
    support_url: null,
    url: null,
  };
  return {
    ...base,
    ...Object.fromEntries(allowed.filter((k) => get(k) !== undefined).map((k) => [k, get(k)])),
  };
}
