import type { Session } from '@/hooks/api/get-session';

export interface NavItem {
  href: string;
  label: string;
  roles: ReadonlyArray<NonNullable<Session['role']>>;
  /** Shown to coordinators and admins only when they are also a rostered person (staff always see it). */
  rosteredOnly?: boolean;
}

/** The workspace's sections; each person sees only those their role may use (DESIGN.md, Roles). */
export const NAV_ITEMS: NavItem[] = [
  { href: '/home', label: 'Overview', roles: ['admin', 'coordinator', 'staff'] },
  { href: '/my-shifts', label: 'My shifts', roles: ['admin', 'coordinator', 'staff'], rosteredOnly: true },
  { href: '/wishes', label: 'Wishes', roles: ['staff'] },
  { href: '/time-away', label: 'Time away', roles: ['staff'] },
  { href: '/swaps', label: 'Swaps', roles: ['staff'] },
  { href: '/my-ledger', label: 'My ledger', roles: ['staff'] },
  // Each feature adds its section here when its screens land.
  { href: '/rosters', label: 'Rosters', roles: ['admin', 'coordinator'] },
  { href: '/people', label: 'People', roles: ['admin', 'coordinator'] },
  { href: '/pairings', label: 'Pairings', roles: ['admin', 'coordinator'] },
  // After Pairings: on a phone the first four coordinator sections stay in the tab bar.
  { href: '/absences', label: 'Absences', roles: ['admin', 'coordinator'] },
  { href: '/changes', label: 'Swaps & open shifts', roles: ['admin', 'coordinator'] },
  { href: '/ledger', label: 'Ledger', roles: ['admin', 'coordinator'] },
  { href: '/members', label: 'Members', roles: ['admin'] },
  { href: '/billing', label: 'Plan & billing', roles: ['admin'] },
  { href: '/account', label: 'Account', roles: ['admin', 'coordinator', 'staff'] },
];

export const navItemsFor = (role: Session['role'], personId: number | null = null) =>
  NAV_ITEMS.filter((item) => role !== null && item.roles.includes(role) && (!item.rosteredOnly || role === 'staff' || personId !== null));
