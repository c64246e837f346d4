import type { SessionUser } from '@/features/auth/users.server';
import { ROLE_GROUPS, type RoleGroup } from '@/features/auth/roles';
import { AppError } from './errors';

/**
 * The one role check every API route makes: 401 when nobody is signed in, 403 when the
 * signed-in role is not in the group. Returns the user (read fresh from the database by the middleware).
 */
export function requireRole(locals: App.Locals, group: RoleGroup): SessionUser {
  const user = locals.user;
  if (!user) throw new AppError(401, 'Sign in first');
  if (!(ROLE_GROUPS[group] as readonly string[]).includes(user.role)) {
    throw new AppError(403, 'Your role may not do this');
  }
  return user;
}

/** Staff of one store act on that store; an admin names the store they act on. */
export function storeScope(user: SessionUser, requestedStoreId?: string | null): string {
  if (user.role === 'admin') {
    const storeId = requestedStoreId ?? user.storeId;
    if (!storeId) throw new AppError(422, 'storeId is required', [{ path: 'storeId', message: 'required for an administrator' }]);
    return storeId;
  }
  if (!user.storeId) throw new AppError(403, 'Your account has no store');
  if (requestedStoreId && requestedStoreId !== user.storeId) throw new AppError(403, 'That store is not yours');
  return user.storeId;
}
