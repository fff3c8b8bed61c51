import { HOME_AREA, type Role } from '../../../../shared/roles';

/** Only same-site paths: "/x" yes, "//evil.example" or "https://…" no. */
export function safeReturnUrl(value: string | null | undefined): string | null {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null;
  return value;
}

export const homeFor = (role: Role) => `/${HOME_AREA[role]}`;

/** Where to go after sign-in: the return URL when this role may see it, else the role's area. */
export function afterSignIn(role: Role, returnUrl: string | null | undefined): string {
  const target = safeReturnUrl(returnUrl);
  if (target && AREA_ROLES.some(([prefix, roles]) => target.startsWith(prefix) && roles.includes(role))) return target;
  if (target && !AREA_ROLES.some(([prefix]) => target.startsWith(prefix))) return target;
  return homeFor(role);
}

// Which roles may enter each area; the server checks every request regardless.
export const AREA_ROLES: [string, Role[]][] = [
  ['/portal', ['homeowner']],
  ['/field', ['technician', 'owner']],
  ['/office', ['office', 'owner']],
  ['/admin', ['owner']],
];
