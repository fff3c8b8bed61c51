import { DateTime, IANAZone } from 'luxon';
import { z } from 'zod';

/** Luxon weekday order: 1 = Monday … 7 = Sunday. */
export const WEEKDAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;
export type Weekday = (typeof WEEKDAYS)[number];

/** Thrown for input the engine cannot work with; `field` is the dotted path of the bad value. */
export class SchedulingInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
    this.name = 'SchedulingInputError';
  }
}

const CLOCK = /^(?:([01]\d|2[0-3]):([0-5]\d)|24:00)$/;

/** Minutes after local midnight for "HH:mm" ("24:00" closes at the end of the day). */
export function clockMinutes(text: string): number {
  const m = CLOCK.exec(text);
  if (!m) throw new Error(`not a clock time: ${text}`);
  if (text === '24:00') return 1440;
  return Number(m[1]) * 60 + Number(m[2]);
}

const clockTime = z.string().regex(CLOCK, 'must be a local clock time "HH:mm" (00:00–24:00)');

const hoursInterval = z
  .object({ open: clockTime, close: clockTime })
  // A malformed time is already reported on its own field.
  .refine((h) => !CLOCK.test(h.open) || !CLOCK.test(h.close) || clockMinutes(h.open) < clockMinutes(h.close), {
    message: 'open must be before close',
    path: ['close'],
  });

/** Local clock intervals per weekday; a missing day is closed. */
export const weeklyHoursSchema = z
  .object({
    mon: z.array(hoursInterval).optional(),
    tue: z.array(hoursInterval).optional(),
    wed: z.array(hoursInterval).optional(),
    thu: z.array(hoursInterval).optional(),
    fri: z.array(hoursInterval).optional(),
    sat: z.array(hoursInterval).optional(),
    sun: z.array(hoursInterval).optional(),
  })
  .strict();
export type WeeklyHours = z.infer<typeof weeklyHoursSchema>;
export type HoursInterval = z.infer<typeof hoursInterval>;

/** An instant: ISO 8601 with an explicit offset or Z, so it never depends on the server's clock. */
export const instantSchema = z.iso.datetime({ offset: true, message: 'must be an ISO date-time with offset' });

const localDate = z.iso.date({ message: 'must be a local date "YYYY-MM-DD"' });

const timeRange = z
  .object({ start: instantSchema, end: instantSchema })
  .refine((r) => Date.parse(r.start) < Date.parse(r.end), { message: 'start must be before end', path: ['end'] });
export type TimeRange = z.infer<typeof timeRange>;

const timeZone = z.string().refine((tz) => IANAZone.isValidZone(tz), { message: 'must be an IANA time zone' });

const minutes = (max: number) => z.number().int('must be whole minutes').min(0).max(max);

export const schedulingSettingsSchema = z.object({
  timeZone,
  businessHours: weeklyHoursSchema,
  /** Minutes on site per visit kind, e.g. { tune_up: 90, no_cooling: 120 }. */
  visitMinutes: z.record(z.string().min(1), z.number().int('must be whole minutes').min(15).max(720)),
  travelBufferMinutes: minutes(240),
  leadTimeMinutes: minutes(14 * 24 * 60),
  /** Share of each day's technician time that ordinary requests may not use (0–0.9). */
  heldBackShare: z.number().min(0).max(0.9),
  windowMinutes: z.number().int('must be whole minutes').min(30).max(720).default(120),
});
export type SchedulingSettings = z.input<typeof schedulingSettingsSchema>;

export const technicianSchema = z.object({
  id: z.string().min(1),
  weeklyHours: weeklyHoursSchema,
  timeOff: z.array(timeRange).default([]),
  skills: z.array(z.string().min(1)).default([]),
});
export type Technician = z.input<typeof technicianSchema>;

export const bookedVisitSchema = z
  .object({
    technicianId: z.string().min(1),
    start: instantSchema,
    end: instantSchema,
    /** Booked for a plan member or an urgent call: it does not use up the ordinary share. */
    priority: z.boolean().default(false),
  })
  .refine((v) => Date.parse(v.start) < Date.parse(v.end), { message: 'start must be before end', path: ['end'] });
export type BookedVisit = z.input<typeof bookedVisitSchema>;

export const availabilityRequestSchema = z
  .object({
    visitKind: z.string().min(1),
    requiredSkill: z.string().min(1).optional(),
    member: z.boolean().default(false),
    urgent: z.boolean().default(false),
    /** First and last local date (company time zone) to search, inclusive. */
    from: localDate,
    to: localDate,
    now: instantSchema,
    /** The member plan's promise: a technician arrives within this many hours. */
    priorityPromiseHours: z.number().positive().max(24 * 14).optional(),
  })
  .refine((r) => r.from <= r.to, { message: 'must not be before from', path: ['to'] })
  .refine((r) => DateTime.fromISO(r.to).diff(DateTime.fromISO(r.from), 'days').days <= 62, {
    message: 'search at most 62 days at a time',
    path: ['to'],
  });
export type AvailabilityRequest = z.input<typeof availabilityRequestSchema>;

export const availabilityInputSchema = z
  .object({
    settings: schedulingSettingsSchema,
    technicians: z.array(technicianSchema),
    booked: z.array(bookedVisitSchema).default([]),
    request: availabilityRequestSchema,
  })
  .superRefine((input, ctx) => {
    if (!(input.request.visitKind in input.settings.visitMinutes)) {
      ctx.addIssue({
        code: 'custom',
        path: ['request', 'visitKind'],
        message: `unknown visit kind "${input.request.visitKind}"`,
      });
    }
    const ids = new Set<string>();
    input.technicians.forEach((t, i) => {
      if (ids.has(t.id)) ctx.addIssue({ code: 'custom', path: ['technicians', i, 'id'], message: 'duplicate id' });
      ids.add(t.id);
    });
  });
export type AvailabilityInput = z.input<typeof availabilityInputSchema>;
export type ParsedAvailabilityInput = z.output<typeof availabilityInputSchema>;

/** Validates and fills defaults; the first problem is reported by its field path. */
export function parseAvailabilityInput(input: unknown): ParsedAvailabilityInput {
  const result = availabilityInputSchema.safeParse(input);
  if (!result.success) {
    const issue = result.error.issues[0]!;
    const field = issue.path.map(String).join('.') || 'input';
    throw new SchedulingInputError(field, issue.message);
  }
  return result.data;
}

export interface ArrivalWindow {
  /** ISO with the company's offset at that instant. */
  start: string;
  end: string;
  /** e.g. "Tue 14 Jul, 8–10 am"; zone abbreviations are added on days the clocks change. */
  localLabel: string;
  /** Visits of the requested kind that can still start in this window for this caller. */
  capacity: number;
  technicianIds: string[];
  meetsPriorityPromise: boolean;
}
