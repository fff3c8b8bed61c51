import ical, { ICalAttendeeRole, ICalAttendeeStatus, ICalCalendarMethod, ICalEventStatus, type ICalCalendar } from 'ical-generator';
import { getVtimezoneComponent } from '@touch4it/ical-timezones';
import { DateTime, IANAZone } from 'luxon';

/** Thrown for invitation input that cannot be written; `field` names the bad value. */
export class CalendarInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
    this.name = 'CalendarInputError';
  }
}

export interface Person {
  name: string;
  email: string;
}

export type When = DateTime | string;

export interface VisitInvitation {
  uid: string;
  /** Raised by one each time the visit is changed or canceled, so calendars replace the old copy. */
  sequence: number;
  method: 'REQUEST' | 'CANCEL';
  /**
   * The event's STATUS (RFC 5545 §3.8.1.11): TENTATIVE while the office has not confirmed it,
   * CONFIRMED once it has; a CANCEL is always CANCELLED. Defaults to CONFIRMED.
   */
  status?: 'TENTATIVE' | 'CONFIRMED' | 'CANCELLED';
  start: When;
  end: When;
  timeZone: string;
  summary: string;
  description?: string;
  location?: string;
  organizer: Person;
  attendee: Person;
  /** DTSTAMP; defaults to now. */
  stamp?: When;
}

const PRODID = { company: 'Seasonwell', product: 'Visits', language: 'EN' };
const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

/** Stable per visit, so a reschedule or a cancellation updates the event the homeowner already has. */
export function visitUid(visitId: string | number): string {
  const id = String(visitId).trim();
  if (!id || /[\s@]/.test(id)) throw new CalendarInputError('visitId', 'must be a non-empty id without spaces or @');
  return `visit-${id}@seasonwell.local`;
}

function checkZone(timeZone: string, field = 'timeZone'): void {
  if (!IANAZone.isValidZone(timeZone) || !getVtimezoneComponent(timeZone)) {
    throw new CalendarInputError(field, `"${timeZone}" is not an IANA time zone with VTIMEZONE data`);
  }
}

/** A Luxon DateTime in the visit's zone: ical-generator then writes the local clock time with TZID. */
function toZoned(value: When, timeZone: string, field: string): DateTime {
  const dt = typeof value === 'string' ? DateTime.fromISO(value, { setZone: true }) : value;
  if (!DateTime.isDateTime(dt) || !dt.isValid) throw new CalendarInputError(field, 'must be a valid ISO date-time');
  if (typeof value === 'string' && !/(Z|[+-]\d{2}:?\d{2})$/i.test(value)) {
    throw new CalendarInputError(field, 'must carry an offset or Z');
  }
  return dt.setZone(timeZone);
}

function checkPerson(p: Person | undefined, field: string): Person {
  if (!p || typeof p.name !== 'string' || !p.name.trim()) throw new CalendarInputError(`${field}.name`, 'is required');
  if (typeof p.email !== 'string' || !EMAIL.test(p.email)) {
    throw new CalendarInputError(`${field}.email`, 'must be an e-mail address');
  }
  return p;
}

function checkText(value: unknown, field: string, required: boolean): string | undefined {
  if (value === undefined && !required) return undefined;
  if (typeof value !== 'string' || (required && !value.trim())) throw new CalendarInputError(field, 'is required');
  return value;
}

/**
 * ical-generator writes DTSTAMP in the calendar's zone without TZID (a floating time);
 * RFC 5545 wants it in UTC, so write it ourselves.
 */
function withUtcStamp(text: string, stamp: DateTime): string {
  const utc = stamp.toUTC().toFormat("yyyyLLdd'T'HHmmss'Z'");
  return text.replace(/^DTSTAMP:[^\r\n]*/gm, `DTSTAMP:${utc}`);
}

function newCalendar(method: ICalCalendarMethod, timeZone: string, name?: string): ICalCalendar {
  const cal = ical({ prodId: PRODID, method, ...(name ? { name } : {}) });
  cal.timezone({ name: timeZone, generator: getVtimezoneComponent });
  return cal;
}

/** The .ics text for a booking (REQUEST) or its cancellation (CANCEL), to attach to the e-mail. */
export function visitInvitation(input: VisitInvitation): string {
  if (input.method !== 'REQUEST' && input.method !== 'CANCEL') {
    throw new CalendarInputError('method', 'must be REQUEST or CANCEL');
  }
  if (!Number.isInteger(input.sequence) || input.sequence < 0) {
    throw new CalendarInputError('sequence', 'must be a whole number of at least 0');
  }
  if (typeof input.uid !== 'string' || !/^\S+@\S+$/.test(input.uid)) {
    throw new CalendarInputError('uid', 'must look like visit-<id>@domain');
  }
  checkZone(input.timeZone);
  const start = toZoned(input.start, input.timeZone, 'start');
  const end = toZoned(input.end, input.timeZone, 'end');
  if (end <= start) throw new CalendarInputError('end', 'must be after start');
  const summary = checkText(input.summary, 'summary', true)!;
  const organizer = checkPerson(input.organizer, 'organizer');
  const attendee = checkPerson(input.attendee, 'attendee');
  const canceled = input.method === 'CANCEL';
  const stamp = input.stamp === undefined ? DateTime.utc() : toZoned(input.stamp, 'UTC', 'stamp');

  const cal = newCalendar(canceled ? ICalCalendarMethod.CANCEL : ICalCalendarMethod.REQUEST, input.timeZone);
  cal.createEvent({
    id: input.uid,
    sequence: input.sequence,
    stamp,
    start,
    end,
    timezone: input.timeZone,
    summary,
    description: checkText(input.description, 'description', false) ?? null,
    location: checkText(input.location, 'location', false) ?? null,
    organizer: { name: organizer.name, email: organizer.email },
    attendees: [
      {
        name: attendee.name,
        email: attendee.email,
        role: ICalAttendeeRole.REQ,
        status: ICalAttendeeStatus.NEEDSACTION,
        rsvp: !canceled,
      },
    ],
    status: canceled || input.status === 'CANCELLED' ? ICalEventStatus.CANCELLED : input.status === 'TENTATIVE' ? ICalEventStatus.TENTATIVE : ICalEventStatus.CONFIRMED,
  });
  return withUtcStamp(cal.toString(), stamp);
}

export interface FeedVisit {
  id: string | number;
  sequence?: number;
  start: When;
  end: When;
  summary: string;
  description?: string;
  location?: string;
  status?: 'scheduled' | 'canceled';
}

export interface TechnicianFeed {
  technician: { id: string; name: string };
  timeZone: string;
  visits: FeedVisit[];
  stamp?: When;
}

/** A subscribable .ics feed of a technician's visits (the caller passes the week it wants). */
export function technicianFeed(input: TechnicianFeed): string {
  if (!input.technician || !input.technician.name?.trim()) {
    throw new CalendarInputError('technician.name', 'is required');
  }
  checkZone(input.timeZone);
  if (!Array.isArray(input.visits)) throw new CalendarInputError('visits', 'must be a list');
  const stamp = input.stamp === undefined ? DateTime.utc() : toZoned(input.stamp, 'UTC', 'stamp');
  const cal = newCalendar(ICalCalendarMethod.PUBLISH, input.timeZone, `Visits: ${input.technician.name}`);
  input.visits.forEach((v, i) => {
    const start = toZoned(v.start, input.timeZone, `visits.${i}.start`);
    const end = toZoned(v.end, input.timeZone, `visits.${i}.end`);
    if (end <= start) throw new CalendarInputError(`visits.${i}.end`, 'must be after start');
    const sequence = v.sequence ?? 0;
    if (!Number.isInteger(sequence) || sequence < 0) {
      throw new CalendarInputError(`visits.${i}.sequence`, 'must be a whole number of at least 0');
    }
    // A canceled visit leaves the feed; subscribed calendars drop it on the next refresh.
    if (v.status === 'canceled') return;
    cal.createEvent({
      id: visitUid(v.id),
      sequence,
      stamp,
      start,
      end,
      timezone: input.timeZone,
      summary: checkText(v.summary, `visits.${i}.summary`, true)!,
      description: checkText(v.description, `visits.${i}.description`, false) ?? null,
      location: checkText(v.location, `visits.${i}.location`, false) ?? null,
      status: ICalEventStatus.CONFIRMED,
    });
  });
  return withUtcStamp(cal.toString(), stamp);
}
