import { ROLE_LABELS, type Role } from '@shared/schemas';

/** Where each role lands after signing in, and what `/` means for them. */
export const ROLE_HOMES: Record<Role, string> = {
  admin: '/admin',
  employer: '/employer',
  operator: '/operator',
  assessor: '/assessor',
  hr: '/hr',
};

export function roleHome(role: Role): string {
  return ROLE_HOMES[role];
}

/** The heading of a role's home page, e.g. "Operator home". */
export function homeHeading(role: Role): string {
  return `${ROLE_LABELS[role]} home`;
}

export interface NavLink {
  label: string;
  to: string;
  icon: string;
}

/** The links in the app shell: only the pages that role may open. */
export function navigationFor(role: Role): NavLink[] {
  const home: NavLink = { label: 'Home', to: roleHome(role), icon: 'pi pi-home' };
  if (role === 'admin') {
    return [
      home,
      { label: 'Users', to: '/admin/users', icon: 'pi pi-users' },
      { label: 'Orders', to: '/admin/orders', icon: 'pi pi-receipt' },
      { label: 'Pricing', to: '/admin/pricing', icon: 'pi pi-tag' },
      { label: 'Credentials', to: '/credentials', icon: 'pi pi-id-card' },
      { label: 'Mail sink', to: '/admin/mail', icon: 'pi pi-envelope' },
    ];
  }
  if (role === 'employer') {
    return [
      home,
      { label: 'Enrol', to: '/employer/enrol', icon: 'pi pi-user-plus' },
      { label: 'Seats', to: '/employer/seats', icon: 'pi pi-ticket' },
      { label: 'Fleet calibration', to: '/employer/fleet', icon: 'pi pi-sliders-h' },
      { label: 'Credentials', to: '/credentials', icon: 'pi pi-id-card' },
      { label: 'Organization', to: '/employer/organization', icon: 'pi pi-building' },
    ];
  }
  if (role === 'operator') {
    return [home, { label: 'Trials', to: '/operator/trials', icon: 'pi pi-map' }, { label: 'Credentials', to: '/credentials', icon: 'pi pi-id-card' }];
  }
  if (role === 'assessor') {
    return [home, { label: 'Review queue', to: '/assessor/reviews', icon: 'pi pi-inbox' }, { label: 'Credentials', to: '/credentials', icon: 'pi pi-id-card' }];
  }
  if (role === 'hr') {
    return [
      home,
      { label: 'Verify', to: '/verify', icon: 'pi pi-search' },
      { label: 'Bulk check', to: '/bulk-verification', icon: 'pi pi-list-check' },
      { label: 'Credentials', to: '/credentials', icon: 'pi pi-id-card' },
    ];
  }
  return [home];
}

/** "Administrator", "Employer and HR", "Operator, Assessor and HR". */
export function describeRoles(roles: readonly Role[]): string {
  const labels = roles.map((role) => ROLE_LABELS[role]);
  if (labels.length <= 1) return labels[0] ?? '';
  return `${labels.slice(0, -1).join(', ')} and ${labels[labels.length - 1]}`;
}
