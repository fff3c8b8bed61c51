import { dateTimeFormat } from './date-formats';

export const VISIT_KINDS = ['tune_up', 'service_call'] as const;
export type VisitKind = (typeof VISIT_KINDS)[number];

export const VISIT_REASONS = ['no_cooling', 'no_heat', 'tune_up', 'noise', 'water_leak', 'thermostat', 'other'] as const;
export type VisitReason = (typeof VISIT_REASONS)[number];

export const VISIT_REASON_LABELS: Record<VisitReason, string> = {
  no_cooling: 'No cooling',
  no_heat: 'No heat',
  tune_up: 'Tune-up',
  noise: 'Strange noise',
  water_leak: 'Water leak',
  thermostat: 'Thermostat problem',
  other: 'Something else',
};

export const VISIT_STATUSES = ['requested', 'scheduled', 'on_the_way', 'on_site', 'done', 'canceled', 'no_show'] as const;
export type VisitStatus = (typeof VISIT_STATUSES)[number];

export const VISIT_STATUS_LABELS: Record<VisitStatus, string> = {
  requested: 'Requested',
  scheduled: 'Scheduled',
  on_the_way: 'On the way',
  on_site: 'On site',
  done: 'Done',
  canceled: 'Canceled',
  no_show: 'No-show',
};

/**
 * Which status may follow which; anything else is refused. A visit is started by the technician
 * (on the way, then on site) before it can be done. Going back to "requested" returns a visit to
 * the unassigned queue.
 */
export const VISIT_TRANSITIONS: Record<VisitStatus, readonly VisitStatus[]> = {
  requested: ['scheduled', 'canceled'],
  scheduled: ['requested', 'on_the_way', 'on_site', 'canceled', 'no_show'],
  on_the_way: ['requested', 'scheduled', 'on_site', 'canceled', 'no_show'],
  on_site: ['done'],
  done: [],
  canceled: [],
  no_show: ['requested', 'scheduled'],
};

/** True when a visit in `from` may move to `to`. Staying in the same status is not a transition. */
export function canTransition(from: VisitStatus, to: VisitStatus): boolean {
  return VISIT_TRANSITIONS[from].includes(to);
}

// ---- Online changes: one cut-off for the confirmation, the visit page, the e-mails and the server ----

/** The company rule for online changes (settings.cancelCutoffHours). */
export interface ChangeRule {
  cancelCutoffHours: number;
}

/** The last moment a homeowner may move or cancel the visit online: the cut-off before the window starts. */
export function changeCutoff(visit: { windowStart: Date | string }, rule: ChangeRule): Date {
  const start = typeof visit.windowStart === 'string' ? Date.parse(visit.windowStart) : visit.windowStart.getTime();
  return new Date(start - rule.cancelCutoffHours * 3_600_000);
}

/** True while the homeowner may still change the visit online: it is open and the cut-off has not passed. */
export function canChangeOnline(visit: { status: VisitStatus; windowStart: Date | string }, rule: ChangeRule, now: Date): boolean {
  const open = visit.status === 'requested' || visit.status === 'scheduled';
  return open && now.getTime() < changeCutoff(visit, rule).getTime();
}

/** "Tue 1 Dec, 9:00 AM" in the company's zone (Intl, so the client needs no date library for it). */
export function cutoffLabel(at: Date | string, timeZone: string): string {
  const when = typeof at === 'string' ? new Date(at) : at;
  const parts = Object.fromEntries(
    dateTimeFormat('en-GB', { timeZone, weekday: 'short', day: 'numeric', month: 'short' })
      .formatToParts(when)
      .map((p) => [p.type, p.value]),
  );
  // ICU writes a narrow no-break space before AM/PM; plain text and tests read a normal space.
  const time = dateTimeFormat('en-US', { timeZone, hour: 'numeric', minute: '2-digit', hour12: true }).format(when).replace(/\s/g, ' ');
  return `${parts['weekday']} ${parts['day']} ${parts['month']}, ${time}`;
}

/** The sentence the homeowner reads about changing the visit, the same at booking, on the page and in e-mails. */
export function changeSentence(canChange: boolean, until: Date | string, phone: string, timeZone: string): string {
  return canChange ? `You can change this visit online until ${cutoffLabel(until, timeZone)}.` : `Changes to this visit are by phone: ${phone}.`;
}

// ---- What each state means, in the same words on the page, in the e-mail and in the calendar file ----

export interface VisitStateWords {
  /** Heading on the booking confirmation and the visit page. */
  heading: string;
  /** One line that says what the state means for the homeowner. */
  meaning: string;
  /** iCalendar STATUS for the visit's event (RFC 5545 §3.8.1.11). */
  calendarStatus: 'TENTATIVE' | 'CONFIRMED' | 'CANCELLED';
  /** Whether a technician may be named: only once the office has assigned one. */
  namesTechnician: boolean;
}

/**
 * Requested: the office has not yet confirmed the window or assigned a technician.
 * Scheduled: the office confirmed the window with a technician.
 */
export const VISIT_STATE_WORDS: Record<VisitStatus, VisitStateWords> = {
  requested: {
    heading: 'Visit requested',
    meaning: 'Requested: the office has not yet confirmed this window or assigned a technician. We e-mail you when it does.',
    calendarStatus: 'TENTATIVE',
    namesTechnician: false,
  },
  scheduled: {
    heading: 'Visit scheduled',
    meaning: 'Scheduled: the office confirmed this window and assigned your technician.',
    calendarStatus: 'CONFIRMED',
    namesTechnician: true,
  },
  on_the_way: { heading: 'Technician on the way', meaning: 'On the way: your technician is driving to you.', calendarStatus: 'CONFIRMED', namesTechnician: true },
  on_site: { heading: 'Technician on site', meaning: 'On site: your technician is at your home.', calendarStatus: 'CONFIRMED', namesTechnician: true },
  done: { heading: 'Visit done', meaning: 'Done: the technician finished this visit.', calendarStatus: 'CONFIRMED', namesTechnician: true },
  canceled: { heading: 'Visit canceled', meaning: 'Canceled: this visit will not take place.', calendarStatus: 'CANCELLED', namesTechnician: false },
  no_show: {
    heading: 'Visit missed',
    meaning: 'Missed: the technician could not reach anyone at the window. Please call the office to book again.',
    calendarStatus: 'CANCELLED',
    namesTechnician: false,
  },
};

/** The technician a homeowner is told of: named only in a state that names one (never on a request). */
export function technicianToTell(status: VisitStatus, technicianName: string | null): string | null {
  return VISIT_STATE_WORDS[status].namesTechnician ? technicianName : null;
}

// ---- A visit's times: the arrival window promised to the homeowner, and the work booked within it ----

/** The hour and minute in `timeZone`, 12-hour: "9", "7:30", with "am" or "pm". */
function clock(at: Date, timeZone: string): { time: string; meridiem: 'am' | 'pm' } {
  const f = dateTimeFormat('en-US', { timeZone, hour: 'numeric', minute: '2-digit', hourCycle: 'h23' });
  const parts = Object.fromEntries(f.formatToParts(at).map((p) => [p.type, p.value]));
  const hour = Number(parts['hour']) % 24;
  const minute = parts['minute'] ?? '00';
  const hour12 = hour % 12 === 0 ? 12 : hour % 12;
  return { time: minute === '00' ? String(hour12) : `${hour12}:${minute}`, meridiem: hour < 12 ? 'am' : 'pm' };
}

/**
 * The one way a time range is written: "8–10 am", "7:30–9:30 am", "10 am–12 pm" across noon, in
 * the company's zone. Booking windows, the technician's day, the homeowner's visits and e-mails use it.
 */
export function timeRangeLabel(start: Date | string | number, end: Date | string | number, timeZone: string): string {
  const a = clock(new Date(start), timeZone);
  const b = clock(new Date(end), timeZone);
  return a.meridiem === b.meridiem ? `${a.time}–${b.time} ${b.meridiem}` : `${a.time} ${a.meridiem}–${b.time} ${b.meridiem}`;
}

/** "1 h 30 min": how long the work is booked for. */
export function workLength(startsAt: Date | string, endsAt: Date | string): string {
  const minutes = Math.round((new Date(endsAt).getTime() - new Date(startsAt).getTime()) / 60_000);
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return [h ? `${h} h` : '', m ? `${m} min` : ''].filter(Boolean).join(' ') || '0 min';
}

/**
 * One definition for every view of a visit's time: the arrival window (when the technician may
 * arrive, as promised to the homeowner) labelled "Arrival", and the booked work labelled with its length.
 */
export function visitTimeLabels(
  v: { windowStart: Date | string; windowEnd: Date | string; startsAt: Date | string; endsAt: Date | string },
  timeZone: string,
): { arrival: string; work: string } {
  return { arrival: `Arrival ${timeRangeLabel(v.windowStart, v.windowEnd, timeZone)}`, work: `${workLength(v.startsAt, v.endsAt)} of work booked` };
}

// ---- Service history: what is coming up, what is past, and windows that passed unstarted ----

/**
 * The arrival window is over and the technician never started: a flag for the office to follow up.
 * The status is left as it is; only a person decides whether it was a no-show or a late start.
 */
export function windowMissed(v: { status: string; windowEnd: Date | string }, now: Date): boolean {
  return (v.status === 'requested' || v.status === 'scheduled') && new Date(v.windowEnd).getTime() <= now.getTime();
}

/**
 * Coming up: visits not yet finished whose window has not passed, soonest first. Past: done,
 * missed and no-show visits, newest first. Sorted by instant, never by the text of a date.
 */
export function groupServiceHistory<T extends { status: string; windowStart: Date | string; windowEnd: Date | string }>(
  visits: readonly T[],
  now: Date,
): { upcoming: T[]; past: T[] } {
  const at = (v: T) => new Date(v.windowStart).getTime();
  const open = ['requested', 'scheduled', 'on_the_way', 'on_site'];
  const upcoming = visits.filter((v) => open.includes(v.status) && !windowMissed(v, now));
  const past = visits.filter((v) => v.status !== 'canceled' && !upcoming.includes(v));
  return { upcoming: [...upcoming].sort((a, b) => at(a) - at(b)), past: [...past].sort((a, b) => at(b) - at(a)) };
}
