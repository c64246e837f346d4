/**
 * Cupel's local payments fake, run in the foreground by the start script:
 *   node_modules/.bin/tsx fakes/payments/server.ts
 * Settings come from FAKE_* environment variables (see README.md).
 */
import { createPaymentsFake, optionsFromEnv, type PaymentsFake } from './app.js';

let fake: PaymentsFake;
try {
  const options = optionsFromEnv();
  fake = await createPaymentsFake({ ...options, log: (line) => console.log(line) });
  const where = options.dataDir ? `state in ${options.dataDir}/payments` : 'state in memory';
  console.log(
    `[fake-payments] payments fake listening on ${fake.url} (webhooks to ${fake.webhookUrl ?? 'nowhere: FAKE_WEBHOOK_URL not set'}, ${where})`,
  );
} catch (err) {
  console.error('[fake-payments] could not start:', (err as Error).message);
  process.exit(1);
}

let stopping = false;
async function stop(signal: NodeJS.Signals) {
  if (stopping) return;
  stopping = true;
  const force = setTimeout(() => process.exit(1), 3_000);
  force.unref();
  try {
    await fake.close();
    console.log(`[fake-payments] stopped on ${signal}`);
    process.exit(0);
  } catch (err) {
    console.error('[fake-payments] could not stop cleanly', err);
    process.exit(1);
  }
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
