import { describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import nodemailer from 'nodemailer';
import { outboxMessages } from '@/db/schema';
import { getTicket, openDrawer, payTicket } from '@/features/counter/tickets.server';
import { receiptAttachments } from '@/features/mail/attachments.server';
import { deliverDueMail, retryDelayMs, smtpTransport } from '@/features/mail/outbox.server';
import { moneyOf } from '@/features/pricing/money';
import { makeSeller, testDb, unique } from '../support/db';
import { makeCounterWorld, setSpots } from '../support/counter';
import { acceptedTicket } from '../support/tickets';

const db = testDb();
const MAILDEV = process.env.MAILDEV_URL;

interface CaughtMail {
  subject: string;
  to: { address: string }[];
  text: string;
  html: string;
  attachments?: { filename: string; contentType: string; size: number }[];
}

async function mailTo(address: string): Promise<CaughtMail[]> {
  if (!MAILDEV) throw new Error('MAILDEV_URL is not set: run through ./docker-free-start.sh test');
  const res = await fetch(`${MAILDEV}/api/email?limit=500`);
  const all = (await res.json()) as CaughtMail[];
  return all.filter((m) => m.to.some((t) => t.address === address));
}

async function paidTicketFor(email: string) {
  const world = await makeCounterWorld(db);
  const seller = await makeSeller(db, world.storeId, { email });
  world.sellerId = seller.id;
  await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
  const t = await acceptedTicket(db, world);
  await openDrawer(db, world.clerk, world.storeId, '3000.00');
  await payTicket(db, world.clerk, t.id, { method: 'cash' });
  return { world, ticket: await getTicket(db, world.clerk, t.id) };
}

/**
 * Runs the outbox until this message has been tried (other test files queue mail in the same
 * database, and one pass takes the 50 oldest), bounded like any wait.
 */
async function deliverUntilTried(address: string, transport: Parameters<typeof deliverDueMail>[1], options: { now?: Date; attempts?: number } = {}) {
  const deadline = Date.now() + 15_000;
  for (;;) {
    await deliverDueMail(db, transport, receiptAttachments(db), { now: options.now });
    const [row] = await db.select().from(outboxMessages).where(eq(outboxMessages.toAddress, address));
    if (row && (row.state !== 'pending' || row.attempts >= (options.attempts ?? 1))) return row;
    if (Date.now() > deadline) throw new Error(`the outbox did not try the message to ${address}`);
  }
}

describe('e-mail through the outbox, caught by maildev', () => {
  it('sends the receipt with the same totals as the ticket, a text and an HTML part, and the PDF', async () => {
    const email = `${unique('receipt')}@example.test`;
    const { ticket } = await paidTicketFor(email);
    const [queued] = await db.select().from(outboxMessages).where(and(eq(outboxMessages.toAddress, email), eq(outboxMessages.kind, 'receipt')));
    expect(queued!.state).toBe('pending');
    await deliverUntilTried(email, smtpTransport());
    const [mail] = await mailTo(email);
    expect(mail).toBeDefined();
    const payout = moneyOf(ticket.payoutMinor, 'USD').formatted;
    const melt = moneyOf(ticket.meltValueMinor, 'USD').formatted;
    expect(mail!.subject).toContain(ticket.reference);
    expect(mail!.subject).toContain(payout);
    for (const part of [mail!.text, mail!.html]) {
      expect(part).toContain(payout);
      expect(part).toContain(melt);
      expect(part).toContain(moneyOf(ticket.marginMinor, 'USD').formatted);
      for (const line of ticket.lines) expect(part).toContain(moneyOf(line.payoutMinor, 'USD').formatted);
      expect(part).toMatch(/held until/i);
      expect(part).not.toContain(ticket.seller.idNumber);
    }
    expect(mail!.attachments).toEqual([expect.objectContaining({ filename: `receipt-${ticket.reference}.pdf`, contentType: 'application/pdf' })]);
    expect(mail!.attachments![0]!.size).toBeGreaterThan(1000);
    const [sent] = await db.select().from(outboxMessages).where(eq(outboxMessages.id, queued!.id));
    expect(sent).toMatchObject({ state: 'sent', attempts: 1 });
  });

  it('keeps the mail while SMTP is down, shows the error, and sends it once when SMTP is back', async () => {
    const email = `${unique('down')}@example.test`;
    await paidTicketFor(email);
    // A port nothing listens on stands for the mail server being down.
    const down = nodemailer.createTransport({ host: '127.0.0.1', port: 1, connectionTimeout: 1000, ignoreTLS: true });
    await deliverUntilTried(email, down);
    const [waiting] = await db.select().from(outboxMessages).where(eq(outboxMessages.toAddress, email));
    expect(waiting).toMatchObject({ state: 'pending', attempts: 1 });
    expect(waiting!.lastError).toMatch(/ECONNREFUSED|connect/i);
    expect(waiting!.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());
    expect(await mailTo(email)).toHaveLength(0);

    // Not due yet: nothing is sent before the backoff ends.
    await deliverDueMail(db, smtpTransport(), receiptAttachments(db));
    expect(await mailTo(email)).toHaveLength(0);

    const later = new Date(Date.now() + retryDelayMs(1) + 1000);
    await deliverUntilTried(email, smtpTransport(), { now: later, attempts: 2 });
    await deliverDueMail(db, smtpTransport(), receiptAttachments(db), { now: later });
    expect(await mailTo(email)).toHaveLength(1);
    const [sent] = await db.select().from(outboxMessages).where(eq(outboxMessages.toAddress, email));
    expect(sent).toMatchObject({ state: 'sent', attempts: 2, lastError: null });
  });

  it('backs off longer after each failure, up to an hour', () => {
    expect([1, 2, 3, 4].map(retryDelayMs)).toEqual([5000, 10000, 20000, 40000]);
    expect(retryDelayMs(30)).toBe(3_600_000);
  });
});
