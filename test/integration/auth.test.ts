import { describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { auditLog, signInFailures, users } from '@/db/schema';
import { bcryptCostOf, BCRYPT_COST } from '@/features/auth/password';
import { THROTTLE_MAX_FAILURES, THROTTLE_MAX_FAILURES_PER_ADDRESS, isSignInThrottled, recordSignInFailure } from '@/features/auth/throttle.server';
import { createStaffUser, loadActiveUser, resetPassword, signInWithPassword, updateUser } from '@/features/auth/users.server';
import { FACTORY_PASSWORD, makeStore, makeUser, testDb, unique } from '../support/db';

const db = testDb();

async function adminActor() {
  const admin = await makeUser(db, { role: 'admin' });
  return (await loadActiveUser(db, admin.id))!;
}

describe('staff accounts', () => {
  it('stores a new password only as a bcrypt hash of cost 12 or more', async () => {
    const actor = await adminActor();
    const store = await makeStore(db);
    const password = 'correct-horse-battery-9';
    const email = `${unique('new')}@example.test`;
    const created = await createStaffUser(db, actor, { name: 'New Clerk', email, role: 'clerk', storeId: store.id, password });
    const [row] = await db.select().from(users).where(eq(users.id, created.id));
    expect(row!.passwordHash).toMatch(/^\$2[aby]\$\d\d\$/);
    expect(bcryptCostOf(row!.passwordHash!)).toBeGreaterThanOrEqual(BCRYPT_COST);
    expect(BCRYPT_COST).toBeGreaterThanOrEqual(12);
    const everything = JSON.stringify(await db.execute(sql`select * from users where id = ${created.id}`));
    expect(everything).not.toContain(password);
    const audit = await db.select().from(auditLog).where(and(eq(auditLog.entityId, created.id), eq(auditLog.action, 'user.create')));
    expect(audit).toHaveLength(1);
    expect(JSON.stringify(audit[0]!.after)).not.toContain('$2');
  });

  it('signs in with the right password and gives the same answer for a wrong password and an unknown e-mail', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    const address = unique('addr');
    const ok = await signInWithPassword(db, clerk.email.toUpperCase(), FACTORY_PASSWORD, address);
    expect(ok).toMatchObject({ status: 'ok', user: { id: clerk.id, role: 'clerk', storeId: clerk.storeId } });
    expect(await signInWithPassword(db, clerk.email, 'wrong-password-000', address)).toEqual({ status: 'invalid' });
    expect(await signInWithPassword(db, `${unique('ghost')}@example.test`, 'wrong-password-000', address)).toEqual({ status: 'invalid' });
  });

  it('refuses a deactivated account at sign-in and at the next request', async () => {
    const actor = await adminActor();
    const clerk = await makeUser(db, { role: 'clerk' });
    expect(await loadActiveUser(db, clerk.id)).not.toBeNull();
    await updateUser(db, actor, clerk.id, { active: false });
    expect(await loadActiveUser(db, clerk.id)).toBeNull();
    expect(await signInWithPassword(db, clerk.email, FACTORY_PASSWORD, unique('addr'))).toEqual({ status: 'invalid' });
  });

  it('applies a changed role at the next request', async () => {
    const actor = await adminActor();
    const clerk = await makeUser(db, { role: 'clerk' });
    await updateUser(db, actor, clerk.id, { role: 'manager' });
    expect((await loadActiveUser(db, clerk.id))!.role).toBe('manager');
    const entries = await db.select().from(auditLog).where(and(eq(auditLog.entityId, clerk.id), eq(auditLog.action, 'user.update')));
    expect(entries[0]!.before).toMatchObject({ role: 'clerk' });
    expect(entries[0]!.after).toMatchObject({ role: 'manager' });
  });

  it('refuses to let an administrator deactivate themself', async () => {
    const actor = await adminActor();
    await expect(updateUser(db, actor, actor.id, { active: false })).rejects.toMatchObject({ status: 409 });
  });

  it('resets a password: the old one stops working, the new one works', async () => {
    const actor = await adminActor();
    const clerk = await makeUser(db, { role: 'clerk' });
    await resetPassword(db, actor, clerk.id, 'a-brand-new-password');
    expect((await signInWithPassword(db, clerk.email, FACTORY_PASSWORD, unique('addr'))).status).toBe('invalid');
    expect((await signInWithPassword(db, clerk.email, 'a-brand-new-password', unique('addr'))).status).toBe('ok');
    await expect(resetPassword(db, actor, 'no-such-user', 'another-long-password')).rejects.toMatchObject({ status: 404 });
  });

  it('refuses a staff account in a store that does not exist with 422 naming storeId', async () => {
    const actor = await adminActor();
    await expect(
      createStaffUser(db, actor, { name: 'X', email: `${unique('x')}@example.test`, role: 'clerk', storeId: 'nope', password: 'long-enough-password' }),
    ).rejects.toMatchObject({ status: 422, issues: [{ path: 'storeId' }] });
  });
});

describe('sign-in throttling', () => {
  it(`pauses an e-mail after ${THROTTLE_MAX_FAILURES} failures in the window, even with the right password`, async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    for (let i = 0; i < THROTTLE_MAX_FAILURES; i++) {
      expect((await signInWithPassword(db, clerk.email, 'wrong-password-000', unique('addr'))).status).toBe('invalid');
    }
    expect((await signInWithPassword(db, clerk.email, FACTORY_PASSWORD, unique('addr'))).status).toBe('throttled');
  });

  it('does not count failures older than the window', async () => {
    const email = `${unique('old')}@example.test`;
    const address = unique('addr');
    const longAgo = new Date(Date.now() - 16 * 60_000);
    for (let i = 0; i < THROTTLE_MAX_FAILURES + 2; i++) await recordSignInFailure(db, email, address, longAgo);
    expect(await isSignInThrottled(db, email, address)).toBe(false);
    for (let i = 0; i < THROTTLE_MAX_FAILURES - 1; i++) await recordSignInFailure(db, email, address);
    expect(await isSignInThrottled(db, email, address)).toBe(false);
    await recordSignInFailure(db, email, address);
    expect(await isSignInThrottled(db, email, address)).toBe(true);
  });

  it(`pauses one client address after ${THROTTLE_MAX_FAILURES_PER_ADDRESS} failures across e-mails`, async () => {
    const address = unique('addr');
    for (let i = 0; i < THROTTLE_MAX_FAILURES_PER_ADDRESS; i++) await recordSignInFailure(db, `${unique('spray')}@example.test`, address);
    expect(await isSignInThrottled(db, `${unique('fresh')}@example.test`, address)).toBe(true);
    expect(await isSignInThrottled(db, `${unique('fresh')}@example.test`, unique('other'))).toBe(false);
  });

  it('clears an e-mail\u2019s failures after a successful sign-in', async () => {
    const clerk = await makeUser(db, { role: 'clerk' });
    await signInWithPassword(db, clerk.email, 'wrong-password-000', unique('addr'));
    expect((await signInWithPassword(db, clerk.email, FACTORY_PASSWORD, unique('addr'))).status).toBe('ok');
    const left = await db.select().from(signInFailures).where(eq(signInFailures.emailKey, clerk.email.toLowerCase()));
    expect(left).toHaveLength(0);
  });
});
