import { z } from 'zod';
import { ROLES } from '../roles';

export const sessionUserSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  email: z.string(),
  role: z.enum(ROLES),
  customerId: z.uuid().nullable(),
});
export type SessionUser = z.infer<typeof sessionUserSchema>;

export const sessionSchema = z.object({ user: sessionUserSchema.nullable() });
export type SessionInfo = z.infer<typeof sessionSchema>;
