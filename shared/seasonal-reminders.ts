import { DateTime } from 'luxon';
import type { ReminderKind } from './reminder-labels';
import { seasonMonths, seasonOfMonth, type Season, type SeasonSettings } from './seasons';
import { FILTER_INTERVAL_DAYS, filterCategory, filterIntervalDays } from './service-life';

/**
 * Who is due for a seasonal reminder. Pure: the server loads households, this decides.
 *
 * Seasons come from the one season table in seasons.ts (the owner's months, or the defaults), the
 * same table coverage and the checklists use. A household on a plan that includes that tune-up,
 * with none done or booked in the current or coming season of that kind, is due.
 */
export { REMINDER_KINDS, REMINDER_LABELS, type ReminderKind } from './reminder-labels';

/** Days between changes for a 1-inch pleated filter (see FILTER_INTERVAL_DAYS for each filter type and its source). */
export const FILTER_INTERVAL_DAYS_THIN = FILTER_INTERVAL_DAYS.one_inch_pleated;
/** Days between changes for a 4- or 5-inch media filter. */
export const FILTER_INTERVAL_DAYS_MEDIA = FILTER_INTERVAL_DAYS.media_4_5_inch;
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
  equipment: { kind: string; filterSize: string; filterType?: string }[];
  /** The last time each kind of reminder went to this household. */
  lastSent: Partial<Record<ReminderKind, string>>;
}

export interface ReminderDecision {
  due: boolean;
  reason: string;
}

const LIVE_AGREEMENT = new Set(['active', 'renewal_due']);
const OUTDOOR = new Set(['condensing_unit', 'heat_pump', 'ductless']);
const DRAIN = new Set(['air_handler', 'gas_furnace', 'heat_pump', 'geothermal_heat_pump', 'ductless', 'condensate_pump']);

/**
 * The bounds of the season of this kind that today is in, or else the next one to come
 * (a heating season may run over New Year).
 */
export function seasonOf(kind: Season, today: DateTime, seasons?: Partial<SeasonSettings> | null): { start: DateTime; end: DateTime } {
  const { first, last } = seasonMonths(kind, seasons);
  const length = ((last - first + 12) % 12) + 1;
  const month = today.startOf('month');
  const start = seasonOfMonth(today.month, seasons) === kind ? month.minus({ months: (today.month - first + 12) % 12 }) : month.plus({ months: (first - today.month + 12) % 12 });
  return { start, end: start.plus({ months: length - 1 }).endOf('month') };
}

function daysSince(iso: string, today: DateTime): number {
  return Math.floor(today.diff(DateTime.fromISO(iso, { zone: today.zone }), 'days').days);
}

export function reminderDecision(kind: ReminderKind, h: ReminderHousehold, today: DateTime, seasons?: Partial<SeasonSettings> | null): ReminderDecision {
  if (!h.email) return { due: false, reason: 'No e-mail address on file' };
  const last = h.lastSent[kind];
  if (last && daysSince(last, today) < RESEND_GUARD_DAYS) return { due: false, reason: `Already reminded ${daysSince(last, today)} days ago` };
  const liveVisits = h.visits.filter((v) => v.status !== 'canceled' && v.status !== 'no_show');

  if (kind === 'cooling_tune_up' || kind === 'heating_tune_up') {
    const season = kind === 'cooling_tune_up' ? 'cooling' : 'heating';
    const a = h.agreement;
    if (!a || !LIVE_AGREEMENT.has(a.status)) return { due: false, reason: 'No plan in force' };
    if ((season === 'cooling' ? a.coolingVisits : a.heatingVisits) < 1) return { due: false, reason: `Plan has no ${season} tune-up` };
    const { start, end } = seasonOf(season, today, seasons);
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
    // The filter that loads up first sets the pace.
    const interval = Math.min(...filters.map((e) => filterIntervalDays(filterCategory(e.filterSize, e.filterType))));
    const lastVisit = liveVisits
      .filter((v) => v.status === 'done')
      .map((v) => v.startsAt)
      .sort()
      .at(-1);
    const lastFilterReminder = h.lastSent.filter;
    const since = [lastVisit, lastFilterReminder]
      .filter((x): x is string => !!x)
      .sort()
      .at(-1);
    if (since && daysSince(since, today) < interval) return { due: false, reason: `Filter looked at ${daysSince(since, today)} days ago` };
    return { due: true, reason: `${filters.map((f) => f.filterSize).join(', ')} filter: change every ${interval} days` };
  }

  if (kind === 'condensate_drain') {
    if (!h.equipment.some((e) => DRAIN.has(e.kind))) return { due: false, reason: 'No indoor coil or drain on file' };
    const lastDrain = h.lastSent.condensate_drain;
    if (lastDrain && daysSince(lastDrain, today) < COIL_CLEANING_INTERVAL_DAYS) return { due: false, reason: 'Reminded within the year' };
    return { due: true, reason: 'Condensate drain service once a year' };
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
          // Monthly alarm test: U.S. Consumer Product Safety Commission advice.
          'A working carbon monoxide alarm near the bedrooms matters too: press its test button once a month.',
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
    case 'condensate_drain':
      return {
        subject: 'Your condensate drain is due for its yearly service',
        paragraphs: [
          'The drain line under your indoor coil carries away the water your system takes out of the air. Algae and dust can plug it, and a plugged drain can flood a ceiling or shut the system off.',
          'Book the service in the portal. Please switch the system off at the thermostat before you look at the drain pan yourself.',
        ],
        action: 'Book a drain service',
      };
  }
}
