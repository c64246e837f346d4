/**
 * Rules for money sent through the payment provider, free of I/O: which provider answers settle a
 * payment and which only mean "not yet", how long a sender holds a payment, and when to try again.
 */

/** Idempotency keys come from Cupel's own rows, so every retry of one step asks the provider for the same thing. */
export const idempotencyKeys = {
  account: (sellerId: string) => `cupel-account-${sellerId}`,
  transfer: (paymentId: string) => `cupel-transfer-${paymentId}`,
  payout: (paymentId: string) => `cupel-payout-${paymentId}`,
  /** Takes back the transfer of a payout the provider refused or failed, so the money is not left on the seller's account. */
  transferReturn: (paymentId: string) => `cupel-transfer-return-${paymentId}`,
  /** A reversal row's own request: the void of a paid electronic ticket, or a payout completed on a closed ticket. */
  reversal: (reversalId: string) => `cupel-reversal-${reversalId}`,
};

export interface ProviderFailure {
  /**
   * refused: the provider answered that it did not do this (bad parameters, not enough balance, an
   * account that cannot be paid); the payment may be failed. transient: no answer, a time-out, a
   * 409 (the same key in use), a 429, a 5xx, or an answer that says nothing of the money; the
   * payment stays pending and is sent again with the same keys.
   */
  kind: 'refused' | 'transient';
  status: number | null;
  code: string | null;
  message: string;
}

export function classifyProviderError(err: unknown): ProviderFailure {
  const e = (err ?? {}) as { type?: string; statusCode?: number; code?: string; message?: string; rawType?: string };
  const status = typeof e.statusCode === 'number' ? e.statusCode : null;
  const code = e.code ?? null;
  const message = String(e.message ?? err ?? 'unknown error').slice(0, 500);
  const refusedType = e.type === 'StripeInvalidRequestError' || e.type === 'StripeCardError';
  const refusedStatus = status === 400 || status === 402 || status === 404;
  if (refusedType && refusedStatus && code !== 'rate_limit' && e.rawType !== 'idempotency_error') {
    return { kind: 'refused', status, code, message };
  }
  return { kind: 'transient', status, code, message };
}

/** Time until the worker sends a pending payment again: 5 s doubling to 10 minutes. */
export function nextSendDelayMs(attempts: number): number {
  const n = Math.max(1, Math.floor(attempts));
  return Math.min(5_000 * 2 ** Math.min(n - 1, 20), 10 * 60_000);
}

/** How long one sender holds a payment; longer than the provider calls it makes (two, each bounded by the SDK time-out). */
export function sendLeaseMs(env: Record<string, string | undefined> = process.env): number {
  const explicit = Number(env.PAYOUT_LEASE_MS);
  if (Number.isFinite(explicit) && explicit > 0) return explicit;
  const timeout = Number(env.STRIPE_TIMEOUT_MS ?? 8000);
  return 3 * (Number.isFinite(timeout) && timeout > 0 ? timeout : 8000) + 5_000;
}

/** Inbox events whose application failed are tried again with the outbox's backoff; after this many they wait for a person. */
export const INBOX_MAX_ATTEMPTS = 12;
export function nextInboxDelayMs(attempts: number): number {
  return Math.min(5_000 * 2 ** Math.max(0, attempts - 1), 60 * 60_000);
}
