import Stripe from 'stripe';

/**
 * The payment provider's SDK, configured from the environment. Locally and in tests it points at
 * Cupel's payments fake (fakes/payments); for the provider's real test mode, set STRIPE_SECRET_KEY
 * to a test key and leave STRIPE_API_HOST unset.
 */
let client: Stripe | undefined;

export function paymentProvider(): Stripe {
  if (!client) {
    const key = process.env.STRIPE_SECRET_KEY;
    if (!key) throw new Error('STRIPE_SECRET_KEY is not set');
    const host = process.env.STRIPE_API_HOST;
    client = new Stripe(key, {
      ...(host
        ? {
            host,
            port: Number(process.env.STRIPE_API_PORT ?? 443),
            protocol: (process.env.STRIPE_API_PROTOCOL ?? 'https') as 'http' | 'https',
          }
        : {}),
      // Retries are Cupel's own (same idempotency key), so a time-out never becomes a second payout.
      maxNetworkRetries: 0,
      timeout: Number(process.env.STRIPE_TIMEOUT_MS ?? 8000),
    });
  }
  return client;
}

export function webhookSecret(): string {
  const secret = process.env.STRIPE_WEBHOOK_SECRET;
  if (!secret) throw new Error('STRIPE_WEBHOOK_SECRET is not set');
  return secret;
}

/** Used by tests that start their own fake on another port. */
export function resetPaymentProvider(): void {
  client = undefined;
}
