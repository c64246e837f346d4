import { and, asc, eq, lte, sql } from 'drizzle-orm';
import nodemailer, { type Transporter } from 'nodemailer';
import { outboxMessages } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';

export type OutboxKind = (typeof outboxMessages.$inferInsert)['kind'];

export interface OutgoingMail {
  storeId: string | null;
  kind: OutboxKind;
  to: string;
  subject: string;
  text: string;
  html: string;
  attachTicketReceiptId?: string | null;
}

/** Queues a message; call inside the transaction of the change that causes it. */
export async function enqueueMail(tx: DbOrTx, mail: OutgoingMail): Promise<string> {
  const [row] = await tx
    .insert(outboxMessages)
    .values({
      storeId: mail.storeId,
      kind: mail.kind,
      toAddress: mail.to,
      subject: mail.subject,
      textBody: mail.text,
      htmlBody: mail.html,
      attachTicketReceiptId: mail.attachTicketReceiptId ?? null,
    })
    .returning({ id: outboxMessages.id });
  return row!.id;
}

export const MAX_ATTEMPTS = 12;

/** Backoff after the n-th failed attempt: 5 s, 10 s, 20 s … capped at one hour. */
export function retryDelayMs(attempts: number): number {
  return Math.min(5_000 * 2 ** Math.max(0, attempts - 1), 3_600_000);
}

export function smtpTransport(): Transporter {
  return nodemailer.createTransport({
    host: process.env.SMTP_HOST ?? '127.0.0.1',
    port: Number(process.env.SMTP_PORT ?? 1025),
    secure: process.env.SMTP_SECURE === 'true',
    ignoreTLS: process.env.SMTP_SECURE !== 'true' && process.env.SMTP_STARTTLS !== 'true',
    auth: process.env.SMTP_USER ? { user: process.env.SMTP_USER, pass: process.env.SMTP_PASSWORD ?? '' } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
    socketTimeout: 10_000,
  });
}

export type AttachmentRenderer = (ticketId: string) => Promise<{ filename: string; content: Buffer; contentType: string }>;

/**
 * Sends what is due, one message at a time. Each message is claimed with SKIP LOCKED so two
 * workers never send the same one; a failure records its error and schedules a retry.
 */
export async function deliverDueMail(
  db: Db,
  transport: Transporter,
  renderAttachment: AttachmentRenderer,
  options: { now?: Date; limit?: number; from?: string } = {},
): Promise<{ sent: number; failed: number }> {
  const now = options.now ?? new Date();
  const from = options.from ?? process.env.MAIL_FROM ?? 'Cupel <receipts@cupel.invalid>';
  let sent = 0;
  let failed = 0;
  for (let i = 0; i < (options.limit ?? 50); i++) {
    const done = await db.transaction(async (tx) => {
      const [msg] = await tx
        .select()
        .from(outboxMessages)
        .where(and(eq(outboxMessages.state, 'pending'), lte(outboxMessages.nextAttemptAt, now)))
        .orderBy(asc(outboxMessages.nextAttemptAt))
        .limit(1)
        .for('update', { skipLocked: true });
      if (!msg) return 'empty' as const;
      try {
        const attachments = msg.attachTicketReceiptId ? [await renderAttachment(msg.attachTicketReceiptId)] : [];
        await transport.sendMail({ from, to: msg.toAddress, subject: msg.subject, text: msg.textBody, html: msg.htmlBody, attachments });
        await tx.update(outboxMessages).set({ state: 'sent', sentAt: new Date(), attempts: msg.attempts + 1, lastError: null }).where(eq(outboxMessages.id, msg.id));
        return 'sent' as const;
      } catch (err) {
        const attempts = msg.attempts + 1;
        await tx
          .update(outboxMessages)
          .set({
            attempts,
            lastError: String((err as Error)?.message ?? err).slice(0, 500),
            state: attempts >= MAX_ATTEMPTS ? 'dead' : 'pending',
            nextAttemptAt: new Date(now.getTime() + retryDelayMs(attempts)),
          })
          .where(eq(outboxMessages.id, msg.id));
        return 'failed' as const;
      }
    });
    if (done === 'empty') break;
    if (done === 'sent') sent++;
    else failed++;
  }
  return { sent, failed };
}

/** Mail not yet sent, with its last error, for the manager's review. */
export async function unsentMail(db: DbOrTx, storeId: string) {
  return db
    .select({
      id: outboxMessages.id,
      kind: outboxMessages.kind,
      toAddress: outboxMessages.toAddress,
      subject: outboxMessages.subject,
      state: outboxMessages.state,
      attempts: outboxMessages.attempts,
      lastError: outboxMessages.lastError,
      nextAttemptAt: outboxMessages.nextAttemptAt,
      createdAt: outboxMessages.createdAt,
    })
    .from(outboxMessages)
    .where(and(eq(outboxMessages.storeId, storeId), sql`${outboxMessages.state} <> 'sent'`))
    .orderBy(asc(outboxMessages.createdAt))
    .limit(100);
}
