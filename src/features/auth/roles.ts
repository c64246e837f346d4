import type { Role } from '@/db/enums';

export type { Role };
export const STAFF_ROLES = ['admin', 'manager', 'clerk'] as const satisfies readonly Role[];

/** Who may do what, by the least role needed. Admins may do anything a manager may, managers anything a clerk may. */
export const ROLE_GROUPS = {
  signedIn: ['admin', 'manager', 'clerk', 'seller'],
  staff: ['admin', 'manager', 'clerk'],
  managers: ['admin', 'manager'],
  admins: ['admin'],
  sellers: ['seller'],
} as const satisfies Record<string, readonly Role[]>;
export type RoleGroup = keyof typeof ROLE_GROUPS;

export function roleAllowed(role: Role, allowed: readonly Role[]): boolean {
  return allowed.includes(role);
}

/** The page each role lands on after sign-in. */
export function homePathFor(role: Role): string {
  switch (role) {
    case 'admin':
      return '/admin';
    case 'manager':
      return '/review';
    case 'clerk':
      return '/counter';
    case 'seller':
      return '/portal';
  }
}

/** Which signed-in roles may open a page path; undefined means any visitor. */
const PAGE_RULES: { prefix: string; roles: readonly Role[] }[] = [
  { prefix: '/admin', roles: ROLE_GROUPS.admins },
  { prefix: '/review', roles: ROLE_GROUPS.managers },
  { prefix: '/counter', roles: ROLE_GROUPS.staff },
  { prefix: '/portal', roles: ROLE_GROUPS.sellers },
];

export function rolesForPage(pathname: string): readonly Role[] | undefined {
  const rule = PAGE_RULES.find((r) => pathname === r.prefix || pathname.startsWith(r.prefix + '/'));
  return rule?.roles;
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  manager: 'Manager',
  clerk: 'Counter clerk',
  seller: 'Seller',
};
