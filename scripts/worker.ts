/**
 * Cupel's background worker, started by docker-free-start.sh. Every few seconds it sends the mail
 * outbox, applies provider events stored in the inbox but not applied (a crash, or a failure now due
 * again), and sends electronic payouts and reversals that an earlier call left pending (same keys).
 * Less often it asks the provider about payouts pending too long.
 */
import { createDb } from '../src/db/client';
import { receiptAttachments } from '../src/features/mail/attachments.server';
import { deliverDueMail, smtpTransport } from '../src/features/mail/outbox.server';
import { applyDueEvents } from '../src/features/payouts/inbox.server';
import { reconcilePendingPayments, retryDueSends } from '../src/features/payouts/sending.server';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set');
const { db, close } = createDb(url, { max: 3 });
const transport = smtpTransport();
const mailEveryMs = Number(process.env.OUTBOX_INTERVAL_MS ?? 2000);
const reconcileEveryMs = Number(process.env.RECONCILE_INTERVAL_MS ?? 60_000);
const reconcileAfterMs = Number(process.env.RECONCILE_AFTER_MS ?? 5 * 60_000);

let stopping = false;
let lastReconcile = 0;

async function tick() {
  try {
    const { sent, failed } = await deliverDueMail(db, transport, receiptAttachments(db));
    if (sent || failed) console.log(`outbox: ${sent} sent, ${failed} failed`);
    const events = await applyDueEvents(db);
    if (events.length) console.log('inbox:', JSON.stringify(events));
    const sends = await retryDueSends(db);
    if (sends.length) console.log('payouts:', JSON.stringify(sends));
    if (Date.now() - lastReconcile >= reconcileEveryMs) {
      lastReconcile = Date.now();
      const outcomes = await reconcilePendingPayments(db, { olderThanMs: reconcileAfterMs });
      if (outcomes.length) console.log('reconcile:', JSON.stringify(outcomes));
    }
  } catch (err) {
    console.error('worker tick failed:', (err as Error).message);
  }
  if (!stopping) timer = setTimeout(tick, mailEveryMs);
}

let timer = setTimeout(tick, 200);
console.log('worker started');

async function stop() {
  stopping = true;
  clearTimeout(timer);
  transport.close();
  await close();
  process.exit(0);
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
