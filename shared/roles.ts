export const ROLES = ['homeowner', 'technician', 'office', 'owner'] as const;
export type Role = (typeof ROLES)[number];
export const STAFF_ROLES = ['technician', 'office', 'owner'] as const satisfies readonly Role[];

/** Which area of the app each role lands in. */
export const HOME_AREA: Record<Role, 'portal' | 'field' | 'office' | 'admin'> = {
  homeowner: 'portal',
  technician: 'field',
  office: 'office',
  owner: 'admin',
};
