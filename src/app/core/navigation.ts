import type { Role } from '../../../shared/roles';

export interface NavLink {
  label: string;
  path: string;
  icon: string;
  /** On a wide screen, listed under "More" rather than in the bar itself. */
  more?: boolean;
}

// Navigation mirrors the server's access rules; the server still checks every request.
const PORTAL: NavLink[] = [
  { label: 'My home', path: '/portal/home', icon: 'home' },
  { label: 'My plan', path: '/portal/plan', icon: 'shield' },
  { label: 'Quotes', path: '/portal/quotes', icon: 'wrench' },
  { label: 'Invoices', path: '/portal/invoices', icon: 'receipt' },
  { label: 'Book a visit', path: '/portal/booking', icon: 'calendar' },
];
const FIELD: NavLink[] = [
  { label: 'Today', path: '/field', icon: 'wrench' },
  { label: 'My week', path: '/field/week', icon: 'calendar' },
  { label: 'My truck', path: '/field/truck', icon: 'truck' },
];
const OFFICE: NavLink[] = [
  { label: 'Office', path: '/office', icon: 'dispatch' },
  { label: 'Households', path: '/office/customers', icon: 'people' },
  { label: 'Renewals', path: '/office/renewals', icon: 'calendar' },
  { label: 'Invoices', path: '/office/invoices', icon: 'receipt' },
  { label: 'Dispatch', path: '/office/dispatch', icon: 'truck' },
  { label: 'Reminders', path: '/office/reminders', icon: 'bell' },
  { label: 'Reports', path: '/office/reports', icon: 'chart' },
  { label: 'Invite household', path: '/office/invite', icon: 'mail' },
];
const ADMIN: NavLink[] = [
  { label: 'Settings', path: '/admin', icon: 'settings' },
  { label: 'Plans', path: '/admin/plans', icon: 'receipt' },
  { label: 'Staff', path: '/admin/staff', icon: 'people' },
  { label: 'Access log', path: '/admin/audit', icon: 'shield' },
];

/** Office pages opened less often, under "More" so the office's and the owner's bars fit a laptop's width. */
const OFFICE_MORE = ['/office/reports', '/office/invite'];
const withMore = (links: NavLink[]) => links.map((l) => (OFFICE_MORE.includes(l.path) ? { ...l, more: true } : l));

export function navigationFor(role: Role | null): NavLink[] {
  switch (role) {
    case 'homeowner':
      return PORTAL;
    case 'technician':
      return FIELD;
    case 'office':
      return withMore(OFFICE);
    case 'owner':
      // The owner's settings pages hang off the Settings landing; the rarer pages sit under
      // "More", keeping the bar to one row at a laptop's width.
      return [...OFFICE.filter((l) => !OFFICE_MORE.includes(l.path)), ADMIN[0]!, ...withMore(OFFICE.filter((l) => OFFICE_MORE.includes(l.path))), { ...FIELD[0]!, more: true }];
    default:
      return [];
  }
}

/**
 * Below this width (CSS px) the bar shows one labelled Menu button instead of its links, so it
 * stays one row: set per role from the width its links need with their words.
 */
export function compactBelow(role: Role | null): number {
  switch (role) {
    case 'homeowner':
      return 760;
    case 'technician':
      return 560;
    case 'office':
      // Six links, More and the account name need about 1,140 px (measured in Chromium).
      return 1180;
    case 'owner':
      // Seven links, More and the account name need about 1,265 px.
      return 1300;
    default:
      return 0;
  }
}
