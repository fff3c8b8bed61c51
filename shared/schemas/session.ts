import * as z from 'zod';
import { ROLES } from '../roles';

export const sessionUserSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  email: z.string(),
  role: z.enum(ROLES),
  customerId: z.uuid().nullable(),
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

/** How the screens write dates (the company's IANA time zone) and phone numbers (its country). */
export const companyLocaleSchema = z.object({ timeZone: z.string(), country: z.string().length(2) });
export type CompanyLocaleInfo = z.infer<typeof companyLocaleSchema>;

export const sessionSchema = z.object({ user: sessionUserSchema.nullable(), company: companyLocaleSchema.nullable().optional() });
export type SessionInfo = z.infer<typeof sessionSchema>;
