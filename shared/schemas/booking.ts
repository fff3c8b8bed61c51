import * as z from 'zod';
import { isoDate, isoInstant } from './dates';
import { VISIT_KINDS, VISIT_REASONS, VISIT_STATUSES, VISIT_TRANSITIONS, type VisitKind, type VisitReason } from '../visits';
export { EMERGENCY_SIGNS, type EmergencySign, EMERGENCY_SIGN_LABELS, SYMPTOMS, URGENT_REASONS } from '../visit-reasons';

// The booking and dispatch API contract: requests parsed on the server, types used by the client.

export function visitKindFor(reason: VisitReason): VisitKind {
  return reason === 'tune_up' ? 'tune_up' : 'service_call';
}

export { BOARD_RANGE_YEARS, BOOKING_HORIZON_MONTHS } from '../horizons';

const uuid = z.uuid({ message: 'must be an id' });
const localDate = isoDate('must be a date "YYYY-MM-DD"');
const instant = isoInstant('must be an ISO date-time with offset');

export const windowsQuerySchema = z.object({
  propertyId: uuid,
  reason: z.enum(VISIT_REASONS, { message: 'choose a reason from the list' }),
  from: localDate.optional(),
  days: z.coerce.number().int('must be whole days').min(1).max(31).default(14),
  /** The visit being moved, when rescheduling: its own time does not count as taken. */
  visitId: uuid.optional(),
});
export type WindowsQuery = z.input<typeof windowsQuerySchema>;

export const bookVisitSchema = z.object({
  propertyId: uuid,
  reason: z.enum(VISIT_REASONS, { message: 'choose a reason from the list' }),
  symptoms: z.array(z.string().trim().min(1).max(120)).max(12, 'at most 12 symptoms').default([]),
  notes: z.string().trim().max(2000, 'keep notes under 2,000 characters').default(''),
  photoIds: z.array(uuid).max(6, 'at most 6 photos').default([]),
  windowStart: instant,
  /** The caller saw the emergency message and none of the danger signs apply. */
  noEmergency: z.literal(true, { message: 'please confirm there is no gas smell, CO alarm, smoke or sparking' }),
});
export type BookVisitRequest = z.input<typeof bookVisitSchema>;

export const rescheduleSchema = z.object({ windowStart: instant });
export const cancelSchema = z.object({ reason: z.string().trim().max(500).default('') });

export const assignSchema = z.object({
  /** null sends the visit back to the unassigned queue. */
  technicianId: uuid.nullable(),
  /** New start for the work (keeps the length); defaults to the current start. */
  startsAt: instant.optional(),
});

export const statusChangeSchema = z.object({
  status: z.enum(VISIT_STATUSES, { message: 'choose a status from the list' }),
  note: z.string().trim().max(500).default(''),
});

export const boardQuerySchema = z.object({
  from: localDate,
  days: z.coerce
    .number()
    .int()
    .refine((d) => d === 1 || d === 7, 'must be 1 (day) or 7 (week)')
    .default(1),
  technicianId: uuid.optional(),
  kind: z.enum(VISIT_KINDS).optional(),
  area: z.string().trim().max(80).optional(),
});

export const timeOffSchema = z
  .object({
    technicianId: uuid,
    startsAt: instant,
    endsAt: instant,
    reason: z.string().trim().max(200).default(''),
  })
  .refine((t) => Date.parse(t.startsAt) < Date.parse(t.endsAt), { message: 'must be after the start', path: ['endsAt'] });

export const weekQuerySchema = z.object({ start: localDate.optional() });

// ---- Responses ----

export interface ArrivalWindowView {
  start: string;
  end: string;
  localLabel: string;
  capacity: number;
  meetsPriorityPromise: boolean;
}

export interface BookingProperty {
  id: string;
  customerId: string;
  customerName: string;
  label: string;
  address: string;
  area: string;
  member: boolean;
  planName: string | null;
  priorityWindowHours: number | null;
}

export interface BookingOptions {
  properties: BookingProperty[];
  cancelCutoffHours: number;
  companyPhone: string;
  timeZone: string;
}

export interface WindowsResponse {
  windows: ArrivalWindowView[];
  member: boolean;
  urgent: boolean;
  priorityWindowHours: number | null;
  timeZone: string;
}

export interface VisitView {
  id: string;
  customerId: string;
  customerName: string;
  propertyId: string;
  address: string;
  area: string;
  kind: VisitKind;
  reason: VisitReason;
  status: (typeof VISIT_STATUSES)[number];
  windowStart: string;
  windowEnd: string;
  windowLabel: string;
  startsAt: string;
  endsAt: string;
  technicianId: string | null;
  technicianName: string | null;
  member: boolean;
  planName: string | null;
  priority: boolean;
  symptoms: string[];
  notes: string;
  sequence: number;
  /** The homeowner may still reschedule or cancel online (before the cut-off). */
  changeableUntil: string;
  canChange: boolean;
  /** "You can change this visit online until …" or "Changes to this visit are by phone: …" (shared/visits.ts). */
  changeNotice: string;
  /** The office's number, for a tap-to-call link wherever online changes are closed. */
  officePhone: string;
  /** The window passed and the visit was never started: flagged for the office; the status is unchanged. */
  windowMissed: boolean;
}

export interface WindowFullBody {
  error: { code: 'window_full'; message: string };
  alternatives: ArrivalWindowView[];
}

export interface BoardTechnician {
  id: string;
  name: string;
  skills: string[];
  truck: string;
  timeOff: { id: string; startsAt: string; endsAt: string; reason: string }[];
}

export interface BoardResponse {
  from: string;
  days: number;
  timeZone: string;
  technicians: BoardTechnician[];
  visits: VisitView[];
  /** The soonest of the requests waiting for the office (at most 50), soonest first. */
  unassigned: VisitView[];
  /** How many wait in all, shown or not. */
  unassignedTotal: number;
  areas: string[];
}

export interface VisitEventView {
  at: string;
  action: string;
  fromStatus: string | null;
  toStatus: string;
  actorName: string | null;
  technicianName: string | null;
  note: string;
}

export interface WeekResponse {
  start: string;
  end: string;
  timeZone: string;
  technician: { id: string; name: string };
  visits: VisitView[];
  feed: { active: boolean; createdAt: string | null };
}

type Status = (typeof VISIT_STATUSES)[number];
/** Which status may follow which: the one table, in shared/visits.ts. */
export const STATUS_TRANSITIONS = VISIT_TRANSITIONS;

/**
 * Statuses that hold the technician's booked time: every one but canceled and no-show, exactly as
 * the database's overlap rule counts them (migration 0002). A finished visit keeps its time, so
 * the engine never offers a window that the insert would then refuse.
 */
export const ACTIVE_STATUSES: readonly Status[] = ['requested', 'scheduled', 'on_the_way', 'on_site', 'done'];
