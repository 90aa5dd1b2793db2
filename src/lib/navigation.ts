import type { Role } from '../db/schema/companies';
import { staffRoles } from '@/db/schema/companies';

export interface NavItem {
  href: string;
  label: string;
  roles: readonly Role[];
}

/** The app shell's navigation: each person sees the parts of the product their role uses. */
const navItems: readonly NavItem[] = [
  { href: '/fleet', label: 'Fleet', roles: ['admin', 'operator'] },
  { href: '/fleet/energy', label: 'Energy', roles: ['admin', 'operator'] },
  { href: '/alerts', label: 'Alerts', roles: staffRoles },
  { href: '/tanks', label: 'Cylinders', roles: staffRoles },
  { href: '/commissioning', label: 'Commissioning', roles: staffRoles },
  { href: '/service', label: 'Service', roles: staffRoles },
  { href: '/home', label: 'My hot water', roles: ['householder'] },
  { href: '/admin', label: 'Company', roles: ['admin'] },
];

export function navFor(role: Role | undefined): NavItem[] {
  return role ? navItems.filter((n) => n.roles.includes(role)) : [];
}

/** The item the page at `path` belongs to: the longest href it starts with (so /fleet/energy is Energy, not Fleet). */
export function currentHref(items: readonly NavItem[], path: string): string | null {
  let best: string | null = null;
  for (const n of items)
    if ((path === n.href || path.startsWith(`${n.href}/`)) && (best === null || n.href.length > best.length))
      best = n.href;
  return best;
}
