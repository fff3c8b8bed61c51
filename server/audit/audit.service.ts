import type { Db, Tx } from '../db/client';
import { auditEvents } from '../db/schema';

export const AUDIT_ACTIONS = [
  'sign_in',
  'sign_in_failed',
  'sign_in_locked',
  'sign_out',
  'sign_out_everywhere',
  'link_requested',
  'password_set',
  'password_reset_requested',
  'household_invited',
  'staff_invited',
  'role_changed',
  'user_disabled',
  'user_enabled',
  'settings_changed',
] as const;
export type AuditAction = (typeof AUDIT_ACTIONS)[number];

export interface AuditEntry {
  action: AuditAction;
  actorUserId?: string | null;
  /** What the event is about, e.g. the e-mail address or user id acted upon. */
  subject?: string;
  ip?: string | null;
  details?: Record<string, unknown>;
  at: Date;
}

export async function recordAudit(db: Db | Tx, entry: AuditEntry): Promise<void> {
  await db.insert(auditEvents).values({
    action: entry.action,
    actorUserId: entry.actorUserId ?? null,
    subject: entry.subject ?? '',
    ip: entry.ip ?? null,
    details: entry.details ?? {},
    at: entry.at,
  });
}
