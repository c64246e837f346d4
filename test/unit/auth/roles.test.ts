import { describe, expect, it } from 'vitest';
import { ROLES, type Role } from '@/db/schema';
import { homePathFor, ROLE_GROUPS, rolesForPage, type RoleGroup } from '@/features/auth/roles';
import { requireRole, storeScope } from '@/lib/auth-guard';
import { AppError } from '@/lib/errors';
import type { SessionUser } from '@/features/auth/users.server';

function userWith(role: Role, storeId: string | null = 'store-1'): SessionUser {
  return { id: `u-${role}`, name: role, email: `${role}@example.test`, role, storeId, storeName: 'Store' };
}

function statusOf(fn: () => unknown): number {
  try {
    fn();
    return 200;
  } catch (err) {
    if (err instanceof AppError) return err.status;
    throw err;
  }
}

const expected: Record<RoleGroup, Record<Role, number>> = {
  signedIn: { admin: 200, manager: 200, clerk: 200, seller: 200 },
  staff: { admin: 200, manager: 200, clerk: 200, seller: 403 },
  managers: { admin: 200, manager: 200, clerk: 403, seller: 403 },
  admins: { admin: 200, manager: 403, clerk: 403, seller: 403 },
  sellers: { admin: 403, manager: 403, clerk: 403, seller: 200 },
};

describe('requireRole, the one API role check', () => {
  for (const group of Object.keys(ROLE_GROUPS) as RoleGroup[]) {
    it(`answers 401 to nobody for ${group}`, () => {
      expect(statusOf(() => requireRole({ user: null }, group))).toBe(401);
    });
    for (const role of ROLES) {
      it(`answers ${expected[group][role]} to a ${role} for ${group}`, () => {
        expect(statusOf(() => requireRole({ user: userWith(role) }, group))).toBe(expected[group][role]);
      });
    }
  }

  it('returns the user it checked', () => {
    const u = userWith('clerk');
    expect(requireRole({ user: u }, 'staff')).toBe(u);
  });
});

describe('store scope', () => {
  it('keeps staff in their own store and lets an admin name one', () => {
    expect(storeScope(userWith('clerk'), undefined)).toBe('store-1');
    expect(storeScope(userWith('clerk'), 'store-1')).toBe('store-1');
    expect(statusOf(() => storeScope(userWith('manager'), 'store-2'))).toBe(403);
    expect(storeScope(userWith('admin', null), 'store-2')).toBe('store-2');
    expect(statusOf(() => storeScope(userWith('admin', null), undefined))).toBe(422);
  });
});

describe('page rules', () => {
  it('sends each role to its own landing page', () => {
    expect(homePathFor('clerk')).toBe('/counter');
    expect(homePathFor('manager')).toBe('/review');
    expect(homePathFor('admin')).toBe('/admin');
    expect(homePathFor('seller')).toBe('/portal');
  });

  it('keeps sellers off staff pages and clerks off admin and review pages', () => {
    expect(rolesForPage('/counter')).not.toContain('seller');
    expect(rolesForPage('/counter/tickets/1')).not.toContain('seller');
    expect(rolesForPage('/admin')).toEqual(['admin']);
    expect(rolesForPage('/admin/users')).not.toContain('clerk');
    expect(rolesForPage('/review')).not.toContain('clerk');
    expect(rolesForPage('/portal')).toEqual(['seller']);
    expect(rolesForPage('/administrator-tools')).toBeUndefined();
    expect(rolesForPage('/signin')).toBeUndefined();
  });

  it('lets every landing page be reached by its own role', () => {
    for (const role of ROLES) expect(rolesForPage(homePathFor(role))).toContain(role);
  });
});
