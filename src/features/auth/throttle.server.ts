import { and, eq, gt, or, sql, count } from 'drizzle-orm';
import { signInFailures } from '@/db/schema';
import type { DbOrTx } from '@/db/client';

/**
 * Five failed sign-ins in fifteen minutes for one e-mail pause sign-in for it; one client address
 * gets more room (twenty), since a shop's counter terminals often share one address.
 */
export const THROTTLE_MAX_FAILURES = 5;
export const THROTTLE_MAX_FAILURES_PER_ADDRESS = 20;
export const THROTTLE_WINDOW_MINUTES = 15;

export function emailKey(email: string): string {
  return email.trim().toLowerCase();
}

export async function isSignInThrottled(db: DbOrTx, email: string, clientAddress: string, now = new Date()): Promise<boolean> {
  const since = new Date(now.getTime() - THROTTLE_WINDOW_MINUTES * 60_000);
  const key = emailKey(email);
  const [row] = await db
    .select({
      byEmail: count(sql`case when ${signInFailures.emailKey} = ${key} then 1 end`),
      byAddress: count(sql`case when ${signInFailures.clientAddress} = ${clientAddress} then 1 end`),
    })
    .from(signInFailures)
    .where(and(gt(signInFailures.at, since), or(eq(signInFailures.emailKey, key), eq(signInFailures.clientAddress, clientAddress))));
  return (row?.byEmail ?? 0) >= THROTTLE_MAX_FAILURES || (row?.byAddress ?? 0) >= THROTTLE_MAX_FAILURES_PER_ADDRESS;
}

export async function recordSignInFailure(db: DbOrTx, email: string, clientAddress: string, at = new Date()): Promise<void> {
  await db.insert(signInFailures).values({ emailKey: emailKey(email), clientAddress, at });
}

/** A successful sign-in clears the e-mail's failures; the address's remain until they age out. */
export async function clearSignInFailures(db: DbOrTx, email: string): Promise<void> {
  await db.delete(signInFailures).where(eq(signInFailures.emailKey, emailKey(email)));
}
