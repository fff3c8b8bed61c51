import * as z from 'zod';
import { EQUIPMENT_KINDS } from '../equipment';
import { HOUSEHOLD_FACTORS } from '../reminders';
import { REMINDER_SEND_STATUSES, type ReminderSendStatus } from '../reminder-sends';
import { REMINDER_KINDS } from '../seasonal-reminders';
import { CAMPAIGN_SCHEDULE_MONTHS } from '../horizons';
import { isIsoDate, withinDateBounds } from './dates';

export const CAMPAIGN_STATUSES = ['draft', 'scheduled', 'sending', 'paused', 'cancelled', 'done'] as const;
export type CampaignStatus = (typeof CAMPAIGN_STATUSES)[number];
export { REMINDER_SEND_STATUSES, REMINDER_SEND_STATUS_LABELS, type ReminderSendStatus } from '../reminder-sends';

export const reminderKindSchema = z.enum(REMINDER_KINDS, { message: 'Choose a reminder: cooling tune-up, heating tune-up, filter, coil cleaning or condensate drain.' });

/** Who a campaign goes to, on top of "due for this kind". Every filter is optional. */
export const audienceFilterSchema = z
  .object({
    /** A plan's code, "none" for households without a plan in force, or "any" (left out: anyone). */
    plan: z.string({ message: 'Plan is a plan code, "none" or "any".' }).trim().min(1, 'Plan is a plan code, "none" or "any".').max(40).optional(),
    /** A ZIP code or a town name. */
    area: z.string({ message: 'Area is a ZIP code or a town.' }).trim().min(1, 'Area is a ZIP code or a town.').max(80).optional(),
    equipmentKind: z.enum(EQUIPMENT_KINDS, { message: 'Equipment kind is not one we record.' }).optional(),
    /** Only households with no tune-up booked this season. */
    noTuneUpThisSeason: z.boolean({ message: 'No tune-up this season is yes or no.' }).optional(),
  })
  .strict();
export type AudienceFilter = z.infer<typeof audienceFilterSchema>;

const queryBool = z
  .enum(['true', 'false'], { message: 'No tune-up this season is true or false.' })
  .transform((v) => v === 'true')
  .optional();

/** The same filters as query parameters, for the count and the preview. */
export const audienceQuerySchema = z.object({
  kind: reminderKindSchema,
  plan: audienceFilterSchema.shape.plan,
  area: audienceFilterSchema.shape.area,
  equipmentKind: audienceFilterSchema.shape.equipmentKind,
  noTuneUpThisSeason: queryBool,
});

export const reminderPreviewQuerySchema = audienceQuerySchema;

/** A campaign is scheduled at most this far ahead (months): the booking horizon, so its reminders can be booked. */
export { CAMPAIGN_SCHEDULE_MONTHS };

const LOCAL_TIME = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})$/;
/** "2026-09-01T08:00": a real calendar day, hours 00–23, minutes 00–59. */
function isLocalTime(value: string): boolean {
  const m = LOCAL_TIME.exec(value);
  return !!m && isIsoDate(m[1]!) && Number(m[2]) <= 23 && Number(m[3]) <= 59;
}

export const createCampaignSchema = z
  .object({
    kind: reminderKindSchema,
    audience: audienceFilterSchema.default({}),
    /** The audience size the sender saw; if it changed since, the send is refused and re-shown. */
    expectedCount: z.number({ message: 'Expected count is a whole number.' }).int('Expected count is a whole number.').min(0, 'Expected count is a whole number.'),
    /**
     * Left out: send now. Otherwise the local time in the company's zone, "YYYY-MM-DDTHH:mm", a
     * real day and hour, and at most CAMPAIGN_SCHEDULE_MONTHS ahead (the service checks that
     * against the clock).
     */
    sendAt: z
      .string({ message: 'Send at is a date and time.' })
      .regex(LOCAL_TIME, { message: 'Send at is a date and time like 2026-09-01T08:00.', abort: true })
      .refine(isLocalTime, { message: 'Send at is not a real date and time.', abort: true })
      .refine((s) => withinDateBounds(s.slice(0, 10)), `Schedule a campaign at most ${CAMPAIGN_SCHEDULE_MONTHS} months ahead.`)
      .optional(),
  })
  .strict();

export const campaignActionSchema = z.object({ action: z.enum(['pause', 'resume', 'cancel'], { message: 'Action is pause, resume or cancel.' }) });

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
  /** Households due, in full only up to the page size; `count` is the whole audience. */
  audience: ReminderRecipient[];
  count: number;
  skipped: number;
  /** Keyset for the next page of `audience`, or null at the end. */
  next: string | null;
}

export interface MessagePreview {
  customerId: string;
  name: string;
  email: string;
  subject: string;
  html: string;
  text: string;
}

export interface ReminderCampaignSummary {
  id: string;
  kind: (typeof REMINDER_KINDS)[number];
  label: string;
  status: CampaignStatus;
  audience: AudienceFilter;
  audienceCount: number;
  sent: number;
  failed: number;
  suppressed: number;
  pending: number;
  scheduledAt: string | null;
  createdAt: string;
  finishedAt: string | null;
  createdBy: string;
}

export interface DeliveryLogEntry {
  customerId: string;
  name: string;
  event: 'sent' | 'retry' | 'failed' | 'suppressed';
  detail: string;
  permanent: boolean;
  at: string;
}

/** A page of a delivery log: one keyset cursor (from the previous page's `next`) and a status. */
export const deliveryPageQuerySchema = z
  .object({
    status: z.enum(REMINDER_SEND_STATUSES, { message: 'Status is pending, sending, sent, failed, suppressed or cancelled.' }).optional(),
    after: z
      .string({ message: 'After is the next-page cursor.' })
      .max(300, 'After is the next-page cursor.')
      .regex(/^[A-Za-z0-9_-]+$/, 'After is the next-page cursor.')
      .optional(),
  })
  .strict();
export type DeliveryPageQuery = z.infer<typeof deliveryPageQuerySchema>;

/** One household in a campaign's outbox: what became of its message, with the mail server's reply. */
export interface CampaignRecipientEntry {
  sendId: string;
  customerId: string;
  name: string;
  email: string;
  status: ReminderSendStatus;
  /** The server's reply: its acceptance when sent, its refusal when failed or waiting for a retry. */
  reply: string | null;
  attempts: number;
  sentAt: string | null;
}

/** One reminder a household was sent (or is queued for), for its page in the office. */
export interface HouseholdReminderEntry {
  sendId: string;
  campaignId: string;
  kind: (typeof REMINDER_KINDS)[number];
  label: string;
  email: string;
  status: ReminderSendStatus;
  reply: string | null;
  queuedAt: string;
  sentAt: string | null;
}

export interface KeysetPage<T> {
  items: T[];
  /** Cursor for the next page, or null at the end. */
  next: string | null;
}

// ---- The homeowner's side ----

export const reminderPreferencesSchema = z
  .object({
    factors: z.array(z.enum(HOUSEHOLD_FACTORS, { message: 'Choose from pets, allergies, smokers or renovation dust.' })).max(HOUSEHOLD_FACTORS.length),
    emailOff: z.array(reminderKindSchema).max(REMINDER_KINDS.length),
  })
  .strict();
export type ReminderPreferences = z.infer<typeof reminderPreferencesSchema>;

export const filterChangedSchema = z.object({ equipmentId: z.uuid({ message: 'Equipment id is not valid.' }) }).strict();

export interface MyDueItem {
  kind: 'cooling_tune_up' | 'heating_tune_up' | 'filter' | 'coil_cleaning' | 'condensate_drain' | 'renewal';
  label: string;
  dueOn: string;
  inDays: number;
  why: string;
  equipmentId?: string;
  propertyId: string;
  /** Where "Book a tune-up" goes, with the kind and the home chosen. */
  bookingPath: string | null;
}

export interface MyReminders {
  items: MyDueItem[];
  preferences: ReminderPreferences;
  /** True when this household has opted out of every reminder by one-click unsubscribe. */
  unsubscribed: boolean;
}
