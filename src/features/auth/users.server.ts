import { and, asc, eq, sql } from 'drizzle-orm';
import { stores, users, type Role } from '@/db/schema';
import type { Db, DbOrTx } from '@/db/client';
import { recordAudit } from '@/features/audit/audit.server';
import { AppError } from '@/lib/errors';
import { hashPassword, verifyPassword } from './password';
import { clearSignInFailures, isSignInThrottled, recordSignInFailure } from './throttle.server';
import type { CreateStaffUserInput } from './auth.schema';

export interface SessionUser {
  id: string;
  name: string;
  email: string;
  role: Role;
  storeId: string | null;
  storeName: string | null;
}

export type SignInResult = { status: 'ok'; user: SessionUser } | { status: 'invalid' } | { status: 'throttled' };

const sessionUserColumns = {
  id: users.id,
  name: users.name,
  email: users.email,
  role: users.role,
  storeId: users.storeId,
  storeName: stores.name,
};

/** The user behind a session, read fresh on every request so that deactivation and role changes apply at once. */
export async function loadActiveUser(db: DbOrTx, userId: string): Promise<SessionUser | null> {
  const [row] = await db
    .select(sessionUserColumns)
    .from(users)
    .leftJoin(stores, eq(stores.id, users.storeId))
    .where(and(eq(users.id, userId), eq(users.active, true)))
    .limit(1);
  return row ?? null;
}

/** Checks an e-mail and password. The answer never tells whether the e-mail exists. */
export async function signInWithPassword(db: Db, email: string, password: string, clientAddress: string): Promise<SignInResult> {
  if (await isSignInThrottled(db, email, clientAddress)) return { status: 'throttled' };
  const [row] = await db
    .select({ ...sessionUserColumns, passwordHash: users.passwordHash, active: users.active })
    .from(users)
    .leftJoin(stores, eq(stores.id, users.storeId))
    .where(sql`lower(${users.email}) = ${email.trim().toLowerCase()}`)
    .limit(1);
  const passwordOk = await verifyPassword(password, row?.passwordHash);
  if (!row || !row.active || !row.passwordHash || !passwordOk) {
    await recordSignInFailure(db, email, clientAddress);
    return { status: 'invalid' };
  }
  await clearSignInFailures(db, email);
  const { passwordHash: _h, active: _a, ...user } = row;
  return { status: 'ok', user };
}

export async function createStaffUser(db: Db, actor: SessionUser, input: CreateStaffUserInput): Promise<SessionUser> {
  const passwordHash = await hashPassword(input.password);
  return db.transaction(async (tx) => {
    if (input.storeId) await requireStore(tx, input.storeId);
    const [created] = await tx
      .insert(users)
      .values({ name: input.name, email: input.email, role: input.role, storeId: input.storeId ?? null, passwordHash })
      .returning({ id: users.id, name: users.name, email: users.email, role: users.role, storeId: users.storeId });
    await recordAudit(tx, {
      storeId: created!.storeId,
      actorUserId: actor.id,
      action: 'user.create',
      entity: 'user',
      entityId: created!.id,
      after: created,
    });
    return (await loadActiveUser(tx, created!.id))!;
  });
}

export async function resetPassword(db: Db, actor: SessionUser, userId: string, password: string): Promise<void> {
  const passwordHash = await hashPassword(password);
  await db.transaction(async (tx) => {
    const [updated] = await tx
      .update(users)
      .set({ passwordHash })
      .where(eq(users.id, userId))
      .returning({ id: users.id, storeId: users.storeId });
    if (!updated) throw new AppError(404, 'No such user');
    await recordAudit(tx, { storeId: updated.storeId, actorUserId: actor.id, action: 'user.password-reset', entity: 'user', entityId: userId });
  });
}

export async function updateUser(
  db: Db,
  actor: SessionUser,
  userId: string,
  change: { role?: Role; active?: boolean; storeId?: string | null },
): Promise<void> {
  if (userId === actor.id && (change.active === false || (change.role && change.role !== actor.role))) {
    throw new AppError(409, 'You cannot deactivate yourself or change your own role');
  }
  await db.transaction(async (tx) => {
    const [before] = await tx
      .select({ role: users.role, active: users.active, storeId: users.storeId })
      .from(users)
      .where(eq(users.id, userId))
      .for('update');
    if (!before) throw new AppError(404, 'No such user');
    if (change.storeId) await requireStore(tx, change.storeId);
    const [after] = await tx
      .update(users)
      .set(change)
      .where(eq(users.id, userId))
      .returning({ role: users.role, active: users.active, storeId: users.storeId });
    await recordAudit(tx, { storeId: after!.storeId, actorUserId: actor.id, action: 'user.update', entity: 'user', entityId: userId, before, after });
  });
}

export async function listUsers(db: DbOrTx) {
  return db
    .select({ ...sessionUserColumns, active: users.active, createdAt: users.createdAt })
    .from(users)
    .leftJoin(stores, eq(stores.id, users.storeId))
    .orderBy(asc(users.role), asc(users.name));
}

export async function listStores(db: DbOrTx) {
  return db.select({ id: stores.id, code: stores.code, name: stores.name, city: stores.city }).from(stores).orderBy(asc(stores.name));
}

async function requireStore(db: DbOrTx, storeId: string): Promise<void> {
  const [s] = await db.select({ id: stores.id }).from(stores).where(eq(stores.id, storeId)).limit(1);
  if (!s) throw new AppError(422, 'storeId: no such store', [{ path: 'storeId', message: 'no such store' }]);
}
