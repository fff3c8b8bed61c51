import { DateTime } from 'luxon';

/**
 * Who is due for a seasonal reminder. Pure: the server loads households, this decides.
 *
 * Seasons (common practice for the central US): the cooling tune-up is done before the cooling
 * season, February through June; the heating tune-up before the heating season, August through
 * November. A household on a plan that includes that tune-up, with none done or booked in the
 * current season, is due.
 */
export const REMINDER_KINDS = ['cooling_tune_up', 'heating_tune_up', 'filter', 'coil_cleaning'] as const;
export type ReminderKind = (typeof REMINDER_KINDS)[number];

export const REMINDER_LABELS: Record<ReminderKind, string> = {
  cooling_tune_up: 'Spring cooling tune-up',
  heating_tune_up: 'Fall heating tune-up',
  filter: 'Filter change',
  coil_cleaning: 'Outdoor coil cleaning',
};

// Months are 1–12, inclusive.
const SEASONS: Record<'cooling' | 'heating', { from: number; to: number }> = {
  cooling: { from: 2, to: 6 },
  heating: { from: 8, to: 11 },
};

/** Days between filter changes for a 1-inch filter (common practice: every 1–3 months). */
export const FILTER_INTERVAL_DAYS_THIN = 90;
/** Days between changes for a 4- or 5-inch media filter (common practice: every 6–12 months). */
export const FILTER_INTERVAL_DAYS_MEDIA = 180;
/** Outdoor coil cleaning once a year (common practice; coil fouling cuts capacity and efficiency). */
export const COIL_CLEANING_INTERVAL_DAYS = 365;
/** The same household is not sent the same kind of reminder twice within this many days. */
export const RESEND_GUARD_DAYS = 30;

export interface ReminderHousehold {
  customerId: string;
  email: string | null;
  /** The agreement in force, if any. */
  agreement: { status: string; coolingVisits: number; heatingVisits: number; extras: string[] } | null;
  /** Tune-ups and other visits, any status; dates as ISO strings. */
  visits: { kind: string; status: string; startsAt: string; recommendations?: string }[];
  equipment: { kind: string; filterSize: string }[];
  /** The last time each kind of reminder went to this household. */
  lastSent: Partial<Record<ReminderKind, string>>;
}

export interface ReminderDecision {
  due: boolean;
  reason: string;
}

const LIVE_AGREEMENT = new Set(['active', 'renewal_due']);
const OUTDOOR = new Set(['condensing_unit', 'heat_pump', 'ductless']);

/** The season a date falls in, and its bounds; null between seasons. */
export function seasonOf(kind: 'cooling' | 'heating', today: DateTime): { start: DateTime; end: DateTime } {
  const s = SEASONS[kind];
  let year = today.year;
  // After the season has ended, the next one is next year's.
  if (today.month > s.to) year += 1;
  const start = DateTime.fromObject({ year, month: s.from, day: 1 }, { zone: today.zone });
  const end = start.set({ month: s.to }).endOf('month');
  return { start, end };
}

function daysSince(iso: string, today: DateTime): number {
  return Math.floor(today.diff(DateTime.fromISO(iso, { zone: today.zone }), 'days').days);
}

export function reminderDecision(kind: ReminderKind, h: ReminderHousehold, today: DateTime): ReminderDecision {
  if (!h.email) return { due: false, reason: 'No e-mail address on file' };
  const last = h.lastSent[kind];
  if (last && daysSince(last, today) < RESEND_GUARD_DAYS) return { due: false, reason: `Already reminded ${daysSince(last, today)} days ago` };
  const liveVisits = h.visits.filter((v) => v.status !== 'canceled' && v.status !== 'no_show');

  if (kind === 'cooling_tune_up' || kind === 'heating_tune_up') {
    const season = kind === 'cooling_tune_up' ? 'cooling' : 'heating';
    const a = h.agreement;
    if (!a || !LIVE_AGREEMENT.has(a.status)) return { due: false, reason: 'No plan in force' };
    if ((season === 'cooling' ? a.coolingVisits : a.heatingVisits) < 1) return { due: false, reason: `Plan has no ${season} tune-up` };
    const { start, end } = seasonOf(season, today);
    const booked = liveVisits.some((v) => {
      if (v.kind !== 'tune_up') return false;
      const at = DateTime.fromISO(v.startsAt, { zone: today.zone });
      return at >= start.minus({ days: 30 }) && at <= end;
    });
    if (booked) return { due: false, reason: `A ${season} tune-up is already done or booked this season` };
    return { due: true, reason: `Plan includes a ${season} tune-up; none booked for ${start.toFormat('LLL')}–${end.toFormat('LLL yyyy')}` };
  }

  if (kind === 'filter') {
    const filters = h.equipment.filter((e) => e.filterSize.trim() !== '');
    if (!filters.length) return { due: false, reason: 'No filter size on file' };
    const media = filters.every((e) => /x\s*[45](\.\d+)?\s*$/i.test(e.filterSize));
    const interval = media ? FILTER_INTERVAL_DAYS_MEDIA : FILTER_INTERVAL_DAYS_THIN;
    const lastVisit = liveVisits.filter((v) => v.status === 'done').map((v) => v.startsAt).sort().at(-1);
    const lastFilterReminder = h.lastSent.filter;
    const since = [lastVisit, lastFilterReminder].filter((x): x is string => !!x).sort().at(-1);
    if (since && daysSince(since, today) < interval) return { due: false, reason: `Filter looked at ${daysSince(since, today)} days ago` };
    return { due: true, reason: `${filters.map((f) => f.filterSize).join(', ')} filter: change every ${interval} days` };
  }

  // Coil cleaning: households with an outdoor coil, and a technician's recommendation or a plan that includes it.
  if (!h.equipment.some((e) => OUTDOOR.has(e.kind))) return { due: false, reason: 'No outdoor coil' };
  const recommended = liveVisits.some((v) => /coil clean/i.test(v.recommendations ?? ''));
  const included = h.agreement && LIVE_AGREEMENT.has(h.agreement.status) && h.agreement.extras.some((x) => /coil clean/i.test(x));
  if (!recommended && !included) return { due: false, reason: 'Not recommended and not in the plan' };
  const lastClean = h.lastSent.coil_cleaning;
  if (lastClean && daysSince(lastClean, today) < COIL_CLEANING_INTERVAL_DAYS) return { due: false, reason: 'Reminded within the year' };
  return { due: true, reason: recommended ? 'Technician recommended coil cleaning' : 'Plan includes a yearly coil cleaning' };
}

/** The subject and body lines of a reminder, in the homeowner's words. */
export function reminderWording(kind: ReminderKind, companyName: string): { subject: string; paragraphs: string[]; action: string } {
  switch (kind) {
    case 'cooling_tune_up':
      return {
        subject: `Time to book your spring cooling tune-up`,
        paragraphs: [
          'Your maintenance plan includes a cooling tune-up before the hot weather. A check now catches a weak part before it fails on the first hot day.',
          'Pick a time that suits you in the portal. It takes about 90 minutes, and someone needs to be home to let the technician in.',
        ],
        action: 'Book my tune-up',
      };
    case 'heating_tune_up':
      return {
        subject: `Time to book your fall heating tune-up`,
        paragraphs: [
          'Your maintenance plan includes a heating tune-up before the cold weather. The technician checks the burners, the flame sensor, the heat exchanger and the safety controls.',
          'A working carbon monoxide alarm near the bedrooms matters too: test it when you change your clocks.',
        ],
        action: 'Book my tune-up',
      };
    case 'filter':
      return {
        subject: 'A reminder to change your air filter',
        paragraphs: [
          'A clogged filter makes your system work harder and can freeze the indoor coil in summer. Your filter size is on the equipment page in the portal.',
          'Turn the system off at the thermostat before you slide the old filter out, and match the airflow arrow on the new one.',
        ],
        action: 'See my filter size',
      };
    case 'coil_cleaning':
      return {
        subject: 'Your outdoor coil is due for a cleaning',
        paragraphs: [
          'Dirt and cottonwood fluff on the outdoor coil cut cooling and raise your bill. A cleaning takes under an hour.',
          `Book it in the portal and ${companyName} will do the rest. Please do not spray the unit with a pressure washer: the fins bend easily.`,
        ],
        action: 'Book a coil cleaning',
      };
  }
}
