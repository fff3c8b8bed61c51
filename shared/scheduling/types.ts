import { DateTime, IANAZone } from 'luxon';
import * as z from 'zod';

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
    priorityPromiseHours: z
      .number()
      .positive()
      .max(24 * 14)
      .optional(),
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

// The pattern zod's z.iso.datetime({ offset: true }) checks (zod 4, seconds required), so a string
// that matches here passes there too.
const INSTANT =
  /^(?:(?:\d\d[2468][048]|\d\d[13579][26]|\d\d0[48]|[02468][048]00|[13579][26]00)-02-29|\d{4}-(?:(?:0[13578]|1[02])-(?:0[1-9]|[12]\d|3[01])|(?:0[469]|11)-(?:0[1-9]|[12]\d|30)|(?:02)-(?:0[1-9]|1\d|2[0-8])))T(?:(?:[01]\d|2[0-3]):[0-5]\d:[0-5]\d(?:\.\d+)?(?:Z|([+-](?:[01]\d|2[0-3]):[0-5]\d)))$/;

type ParsedBooked = ParsedAvailabilityInput['booked'];

/**
 * Booked visits checked by hand, as bookedVisitSchema would accept them, with its output; null when
 * any one might not pass, so the schema itself then reports the problem. The calendar is the large
 * part of the input and the same on every call: checking it with zod cost more than the search.
 */
function plainBooked(booked: unknown): ParsedBooked | null {
  if (booked === undefined) return [];
  if (!Array.isArray(booked)) return null;
  const out: ParsedBooked = new Array(booked.length);
  for (let i = 0; i < booked.length; i++) {
    const v = booked[i] as Record<string, unknown> | null;
    if (typeof v !== 'object' || v === null || Array.isArray(v)) return null;
    const { technicianId, start, end, priority } = v;
    if (typeof technicianId !== 'string' || technicianId.length === 0) return null;
    if (typeof start !== 'string' || typeof end !== 'string' || !INSTANT.test(start) || !INSTANT.test(end)) return null;
    if (!(Date.parse(start) < Date.parse(end))) return null;
    if (priority !== undefined && typeof priority !== 'boolean') return null;
    out[i] = { technicianId, start, end, priority: priority ?? false };
  }
  return out;
}

/** Validates and fills defaults; the first problem is reported by its field path. */
export function parseAvailabilityInput(input: unknown): ParsedAvailabilityInput {
  if (typeof input === 'object' && input !== null && !Array.isArray(input)) {
    const booked = plainBooked((input as { booked?: unknown }).booked);
    if (booked) {
      // The rest is small: the schema checks it as before, with the booked visits already known good.
      const rest = availabilityInputSchema.safeParse({ ...input, booked: [] });
      if (rest.success) return { ...rest.data, booked };
    }
  }
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
