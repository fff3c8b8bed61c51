import { z } from 'zod';
import { REMINDER_KINDS } from '../seasonal-reminders';

export const reminderKindSchema = z.enum(REMINDER_KINDS, { message: 'Choose a reminder: cooling tune-up, heating tune-up, filter or coil cleaning.' });

export const reminderPreviewQuerySchema = z.object({ kind: reminderKindSchema });
export const createCampaignSchema = z.object({
  kind: reminderKindSchema,
  /** The audience size the sender saw; if it changed since, the send is refused and re-shown. */
  expectedCount: z.number({ message: 'Expected count is a whole number.' }).int().min(0),
});

export interface ReminderRecipient {
  customerId: string;
  name: string;
  email: string;
  reason: string;
}

export interface ReminderPreview {
  kind: (typeof REMINDER_KINDS)[number];
  label: string;
  subject: string;
  audience: ReminderRecipient[];
  skipped: number;
}

export interface ReminderCampaignSummary {
  id: string;
  kind: (typeof REMINDER_KINDS)[number];
  label: string;
  audienceCount: number;
  sent: number;
  failed: number;
  pending: number;
  createdAt: string;
  finishedAt: string | null;
  createdBy: string;
}
