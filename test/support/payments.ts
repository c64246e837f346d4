import type { PaymentsFake } from '../../fakes/payments/app';
import { resetPaymentProvider } from '@/features/settlement/provider.server';

/** Points the provider SDK at a payments fake started by the test, with a short time-out, and drops the cached client. */
export function usePaymentsFake(fake: PaymentsFake, options: { secretKey: string; webhookSecret: string }): void {
  process.env.STRIPE_SECRET_KEY = options.secretKey;
  process.env.STRIPE_API_HOST = '127.0.0.1';
  process.env.STRIPE_API_PORT = String(fake.port);
  process.env.STRIPE_API_PROTOCOL = 'http';
  process.env.STRIPE_WEBHOOK_SECRET = options.webhookSecret;
  process.env.STRIPE_TIMEOUT_MS = '1500';
  resetPaymentProvider();
}
