import { describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { classifyProviderError, idempotencyKeys, nextSendDelayMs, sendLeaseMs } from '@/features/payouts/payouts';

type RawErrorType = NonNullable<ConstructorParameters<typeof Stripe.errors.StripeAPIError>[0]>['type'];
const raw = (statusCode: number, type: RawErrorType, code?: string) => ({ statusCode, type, code, message: `${type} ${code ?? ''}` });

describe('which provider answers settle a payment', () => {
  it('a refusal by the provider (400 with a business code, 402, 404) may fail the payment', () => {
    expect(classifyProviderError(new Stripe.errors.StripeInvalidRequestError(raw(400, 'invalid_request_error', 'balance_insufficient'))).kind).toBe('refused');
    expect(classifyProviderError(new Stripe.errors.StripeCardError(raw(402, 'card_error', 'card_declined'))).kind).toBe('refused');
    expect(classifyProviderError(new Stripe.errors.StripeInvalidRequestError(raw(404, 'invalid_request_error', 'resource_missing'))).kind).toBe('refused');
  });

  it('no answer, 409 key in use, 429, 5xx, an idempotency mismatch or a key problem leave it pending', () => {
    const transient = [
      new Stripe.errors.StripeConnectionError({ message: 'socket hang up' }),
      new Stripe.errors.StripeAPIError(raw(409, 'idempotency_error', 'idempotency_key_in_use')),
      new Stripe.errors.StripeRateLimitError(raw(429, 'invalid_request_error', 'rate_limit')),
      new Stripe.errors.StripeAPIError(raw(500, 'api_error')),
      new Stripe.errors.StripeIdempotencyError(raw(400, 'idempotency_error')),
      new Stripe.errors.StripeAuthenticationError(raw(401, 'authentication_error')),
      new Error('ECONNRESET'),
      undefined,
    ];
    for (const err of transient) expect(classifyProviderError(err).kind).toBe('transient');
    expect(classifyProviderError(new Stripe.errors.StripeAPIError(raw(409, 'idempotency_error', 'idempotency_key_in_use')))).toMatchObject({ status: 409, code: 'idempotency_key_in_use' });
  });
});

describe('retry timing and keys', () => {
  it('backs off 5 s doubling to 10 minutes', () => {
    expect([1, 2, 3, 4, 7, 8, 50].map(nextSendDelayMs)).toEqual([5_000, 10_000, 20_000, 40_000, 320_000, 600_000, 600_000]);
    expect(nextSendDelayMs(0)).toBe(5_000);
  });

  it('holds the send lease longer than the provider calls it makes', () => {
    expect(sendLeaseMs({ STRIPE_TIMEOUT_MS: '8000' })).toBe(29_000);
    expect(sendLeaseMs({ PAYOUT_LEASE_MS: '3000', STRIPE_TIMEOUT_MS: '8000' })).toBe(3_000);
    expect(sendLeaseMs({})).toBe(29_000);
  });

  it('derives every key from Cupel\u2019s own row, one per step', () => {
    const keys = [idempotencyKeys.transfer('p1'), idempotencyKeys.payout('p1'), idempotencyKeys.transferReturn('p1'), idempotencyKeys.reversal('p1')];
    expect(new Set(keys).size).toBe(4);
    expect(idempotencyKeys.transfer('p1')).toBe(idempotencyKeys.transfer('p1'));
  });
});
