import { and, eq, sql } from 'drizzle-orm';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import type { Adapter } from '@auth/core/adapters';
import { accounts, sessions, users, verificationTokens } from '@/db/schema';
import { getDb, type DbOrTx } from '@/db/client';
import { enqueueMail } from '@/features/mail/outbox.server';
import { signInLinkMail } from '@/features/mail/templates';

const ADAPTER_METHODS = [
  'createUser',
  'getUser',
  'getUserByEmail',
  'getUserByAccount',
  'updateUser',
  'deleteUser',
  'linkAccount',
  'unlinkAccount',
  'createSession',
  'getSessionAndUser',
  'updateSession',
  'deleteSession',
  'createVerificationToken',
  'useVerificationToken',
] as const;

/** The Auth.js adapter over Cupel's own tables, built on first use so that loading the config opens no connection. */
export function lazyAdapter(): Adapter {
  let real: Adapter | undefined;
  const get = () =>
    (real ??= DrizzleAdapter(getDb() as never, { usersTable: users, accountsTable: accounts, sessionsTable: sessions, verificationTokensTable: verificationTokens } as never));
  const adapter: Record<string, unknown> = {};
  for (const method of ADAPTER_METHODS) {
    adapter[method] = (...args: unknown[]) => (get()[method] as (...a: unknown[]) => unknown)(...args);
  }
  return adapter as Adapter;
}

export async function activeSellerByEmail(db: DbOrTx, email: string) {
  const [row] = await db
    .select({ id: users.id, storeId: users.storeId })
    .from(users)
    .where(and(sql`lower(${users.email}) = ${email.trim().toLowerCase()}`, eq(users.role, 'seller'), eq(users.active, true)));
  return row ?? null;
}

/**
 * Auth.js asks for a sign-in link to be sent: it goes through the outbox like every e-mail. Only an
 * active seller's address gets one; for any other the answer is the same and nothing is sent.
 */
export async function queueSignInLink(identifier: string, url: string): Promise<void> {
  const db = getDb();
  const seller = await activeSellerByEmail(db, identifier);
  if (!seller) return;
  await db.transaction(async (tx) => {
    await enqueueMail(tx, { storeId: seller.storeId, kind: 'portal-sign-in', to: identifier, ...signInLinkMail({ url }) });
  });
}
