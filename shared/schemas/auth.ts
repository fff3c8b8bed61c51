import * as z from 'zod';
import { pageFields } from './lists';
import { sessionUserSchema } from './session';

const email = z
  .string({ error: 'Enter your e-mail address.' })
  .trim()
  .toLowerCase()
  .max(254, 'That e-mail address is too long.')
  .pipe(z.email({ error: 'Enter a valid e-mail address, like name@example.com.' }));

export const MIN_PASSWORD_LENGTH = 12;
export const MAX_PASSWORD_LENGTH = 256;

export const staffSignInSchema = z.object({
  email,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(MAX_PASSWORD_LENGTH, 'That password is too long.'),
});
export type StaffSignIn = z.infer<typeof staffSignInSchema>;

export const linkRequestSchema = z.object({ email });
export type LinkRequest = z.infer<typeof linkRequestSchema>;

const token = z
  .string({ error: 'The link is missing its token.' })
  .min(20, 'This link is not complete. Please open it again from the e-mail.')
  .max(4096, 'This link is not valid.');

export const linkConfirmSchema = z.object({ token });

export const setPasswordSchema = z.object({
  token,
  password: z
    .string({ error: 'Choose a password.' })
    .min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters.`)
    .max(MAX_PASSWORD_LENGTH, 'That password is too long.'),
});
export type SetPassword = z.infer<typeof setPasswordSchema>;

export const forgotPasswordSchema = z.object({ email });

export const STAFF_INVITE_ROLES = ['technician', 'office'] as const;
export const staffInviteSchema = z.object({
  email,
  name: z.string({ error: 'Enter a name.' }).trim().min(1, 'Enter a name.').max(120, 'Keep the name under 120 characters.'),
  role: z.enum(STAFF_INVITE_ROLES, { error: 'Choose technician or office.' }),
});
export type StaffInvite = z.infer<typeof staffInviteSchema>;

export const householdInviteSchema = z.object({
  customerId: z.uuid({ error: 'That is not a customer number we know.' }).optional(),
  email: email.optional(),
  name: z.string().trim().min(1, 'Enter a name.').max(120, 'Keep the name under 120 characters.').optional(),
});
export type HouseholdInvite = z.infer<typeof householdInviteSchema>;

export const staffUpdateSchema = z
  .object({
    disabled: z.boolean({ error: 'Disabled is true or false.' }).optional(),
    role: z.enum(STAFF_INVITE_ROLES, { error: 'Choose technician or office.' }).optional(),
  })
  .refine((v) => v.disabled !== undefined || v.role !== undefined, { error: 'Send disabled or role.' });
export type StaffUpdate = z.infer<typeof staffUpdateSchema>;

export const signInResponseSchema = z.object({ user: sessionUserSchema });

/** What every link or reset request answers, whether or not the address is known. */
export const LINK_SENT_MESSAGE = 'If that address belongs to an account, we have sent it a link. It works once, for 10 minutes.';
export const RESET_SENT_MESSAGE = 'If that address belongs to a staff account, we have sent it a link to set a new password.';
export const acceptedSchema = z.object({ message: z.string() });

export const staffMemberSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  email: z.string(),
  role: z.enum(['technician', 'office', 'owner']),
  disabled: z.boolean(),
  lastSignInAt: z.string().nullable(),
  invitedPending: z.boolean(),
});
export type StaffMember = z.infer<typeof staffMemberSchema>;

export const auditEventSchema = z.object({
  id: z.uuid(),
  at: z.string(),
  actorUserId: z.uuid().nullable(),
  actorName: z.string().nullable(),
  action: z.string(),
  subject: z.string(),
  ip: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;
export const auditPageSchema = z.object({ items: z.array(auditEventSchema), total: z.number().int(), page: z.number().int(), pageSize: z.number().int() });
export type AuditPage = z.infer<typeof auditPageSchema>;
export const auditQuerySchema = z.object({
  ...pageFields,
  action: z.string().max(40).optional(),
});
