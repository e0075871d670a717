import type { Session } from '@/hooks/api/get-session';

export interface NavItem {
  href: string;
  label: string;
  roles: ReadonlyArray<NonNullable<Session['role']>>;
}

/** The workspace's sections; each person sees only those their role may use (DESIGN.md, Roles). */
export const NAV_ITEMS: NavItem[] = [
  { href: '/home', label: 'Overview', roles: ['admin', 'coordinator', 'staff'] },
  // Each feature adds its section here when its screens land.
  { href: '/members', label: 'Members', roles: ['admin'] },
  { href: '/account', label: 'Account', roles: ['admin', 'coordinator', 'staff'] },
];

export const navItemsFor = (role: Session['role']) => NAV_ITEMS.filter((item) => role !== null && item.roles.includes(role));
