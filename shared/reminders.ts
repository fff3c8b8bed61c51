import { DateTime } from 'luxon';
import type { HouseholdFactor } from './reminder-labels';
import { renewalNoticesDue, type NoticeAgreement, type RenewalNotice } from './renewals';
import { seasonMonths, seasonOfMonth, type Season, type SeasonSettings } from './seasons';
import { FILTER_CATEGORY_LABELS, FILTER_INTERVAL_DAYS, filterCategory, type FilterCategory } from './service-life';

/**
 * When each upkeep item of a home falls due. Pure: callers pass the household's records and
 * "today" in the company's time zone; the audience SQL on the server applies the same numbers.
 */

export { HOUSEHOLD_FACTORS, HOUSEHOLD_FACTOR_LABELS, dueWords, type HouseholdFactor } from './reminder-labels';

/** Share of the filter's normal interval that each factor leaves; several factors multiply. */
export const FILTER_FACTOR_SHARE: Record<HouseholdFactor, { share: number; source: string }> = {
  pets: { share: 2 / 3, source: 'Common practice (filter makers\u2019 guidance): with pets, change about every 60 days instead of 90' },
  allergies: { share: 2 / 3, source: 'Common practice: allergy or asthma households change about every 6 to 8 weeks' },
  smokers: { share: 1 / 2, source: 'Common practice: indoor smoking loads a filter about twice as fast' },
  renovation_dust: { share: 1 / 3, source: 'Common practice: check monthly and change as soon as it looks grey during dusty work' },
};

/** No filter interval shorter than two weeks, however many factors apply (common practice). */
export const MIN_FILTER_DAYS = 14;
/** Coil cleaning and condensate drain service once a year (ENERGY STAR maintenance checklist, from memory). */
export const YEARLY_SERVICE_DAYS = 365;
/** A technician's recommendation brings the service forward to this many days after that visit (common practice). */
export const RECOMMENDED_SERVICE_DAYS = 30;
/** Items are listed this many days before they fall due (common practice: time to get a filter in). */
export const DUE_SOON_DAYS = 14;
/** A tune-up booked up to this many days before its season opens counts for that season. */
export const EARLY_BOOKING_DAYS = 30;

export const COOLING_KINDS = new Set(['condensing_unit', 'heat_pump', 'geothermal_heat_pump', 'ductless']);
export const HEATING_KINDS = new Set(['gas_furnace', 'heat_pump', 'geothermal_heat_pump', 'ductless']);
export const OUTDOOR_COIL_KINDS = new Set(['condensing_unit', 'heat_pump', 'ductless']);
/** Equipment with an indoor coil and a condensate drain line. */
export const DRAIN_KINDS = new Set(['air_handler', 'gas_furnace', 'heat_pump', 'geothermal_heat_pump', 'ductless', 'condensate_pump']);

/** The filter's change interval in days for this household. */
export function filterIntervalFor(category: FilterCategory, factors: readonly HouseholdFactor[]): number {
  const base = FILTER_INTERVAL_DAYS[category];
  if (base === undefined) throw new RangeError(`filterType: unknown filter type "${String(category)}"`);
  let share = 1;
  for (const f of new Set(factors)) {
    const s = FILTER_FACTOR_SHARE[f];
    if (!s) throw new RangeError(`factors: unknown household factor "${String(f)}"`);
    share *= s.share;
  }
  return Math.max(MIN_FILTER_DAYS, Math.round(base * share));
}

/** "16x25x1" as the homeowner reads it: "16×25×1". */
export const filterSizeLabel = (size: string) => size.trim().replace(/\s*[xX×]\s*/g, '×');

export interface SeasonWindow {
  start: DateTime;
  end: DateTime;
}

/** The season of this kind that today is in, or else the next one (heating may run over New Year). */
export function seasonWindow(season: Season, today: DateTime, settings?: Partial<SeasonSettings> | null): SeasonWindow {
  const { first, last } = seasonMonths(season, settings);
  const length = ((last - first + 12) % 12) + 1;
  const month = today.startOf('month');
  const start =
    seasonOfMonth(today.month, settings) === season ? month.minus({ months: (today.month - first + 12) % 12 }) : month.plus({ months: (first - today.month + 12) % 12 });
  return { start, end: start.plus({ months: length - 1 }).endOf('month') };
}

export type DueKind = 'cooling_tune_up' | 'heating_tune_up' | 'filter' | 'coil_cleaning' | 'condensate_drain' | 'renewal';

export interface HomeRecords {
  factors: readonly HouseholdFactor[];
  /** The agreement in force, if any; `termEnd` is its exclusive end date. */
  agreement: { status: string; coolingVisits: number; heatingVisits: number; termEnd: string; noticesSent: readonly RenewalNotice[] } | null;
  equipment: { id: string; kind: string; filterSize: string; filterType: string; installedOn?: string | null }[];
  /** Visits at this home, any status, as ISO instants. */
  visits: { kind: string; status: string; startsAt: string; recommendations?: string }[];
  /** The homeowner's "I changed it", per equipment id, as ISO instants. */
  filterChanges: Record<string, string>;
}

export interface DueItem {
  kind: DueKind;
  /** The equipment it concerns, for filters. */
  equipmentId?: string;
  label: string;
  /** Local date (YYYY-MM-DD) it falls due. */
  dueOn: string;
  /** Whole days from today; negative when overdue. */
  inDays: number;
  why: string;
}

const LIVE_AGREEMENT = new Set(['active', 'renewal_due']);
const liveVisit = (v: { status: string }) => v.status !== 'canceled' && v.status !== 'no_show';
const local = (iso: string, zone: DateTime) => DateTime.fromISO(iso, { zone: zone.zone }).startOf('day');

function item(kind: DueKind, label: string, due: DateTime, today: DateTime, why: string, equipmentId?: string): DueItem {
  return { kind, label, dueOn: due.toISODate()!, inDays: Math.round(due.startOf('day').diff(today.startOf('day'), 'days').days), why, ...(equipmentId ? { equipmentId } : {}) };
}

/** The tune-up of one season, if the plan includes it, the home has equipment for it and none is booked. */
export function tuneUpDue(season: Season, h: HomeRecords, today: DateTime, settings?: Partial<SeasonSettings> | null): DueItem | null {
  const a = h.agreement;
  if (!a || !LIVE_AGREEMENT.has(a.status)) return null;
  if ((season === 'cooling' ? a.coolingVisits : a.heatingVisits) < 1) return null;
  const kinds = season === 'cooling' ? COOLING_KINDS : HEATING_KINDS;
  // Unknown equipment: the plan still promises the visit.
  if (h.equipment.length && !h.equipment.some((e) => kinds.has(e.kind))) return null;
  const w = seasonWindow(season, today, settings);
  const from = w.start.minus({ days: EARLY_BOOKING_DAYS });
  const booked = h.visits.some((v) => v.kind === 'tune_up' && liveVisit(v) && DateTime.fromISO(v.startsAt) >= from && DateTime.fromISO(v.startsAt) <= w.end);
  if (booked) return null;
  const label = season === 'cooling' ? 'Spring cooling tune-up' : 'Fall heating tune-up';
  const due = w.start > today ? w.start : today;
  return item(`${season}_tune_up`, label, due, today, `Your plan includes a ${season} tune-up for ${w.start.toFormat('LLLL')}\u2013${w.end.toFormat('LLLL yyyy')}.`);
}

/** Each filter on file: its interval from its type and the household, counted from the last change. */
export function filtersDue(h: HomeRecords, today: DateTime): DueItem[] {
  const done = h.visits.filter((v) => v.status === 'done').map((v) => v.startsAt);
  const out: DueItem[] = [];
  for (const e of h.equipment) {
    if (!e.filterSize.trim()) continue;
    const category = filterCategory(e.filterSize, e.filterType);
    const days = filterIntervalFor(category, h.factors);
    // A technician changes the filter at every completed visit (common practice).
    const changes = [...done, h.filterChanges[e.id]].filter((x): x is string => !!x).map((x) => local(x, today));
    const last = changes.length ? DateTime.max(...changes) : null;
    const due = last ? last.plus({ days }) : today;
    out.push(
      item(
        'filter',
        `Filter (${filterSizeLabel(e.filterSize)})`,
        due,
        today,
        `${FILTER_CATEGORY_LABELS[category]} filter: every ${days} days${h.factors.length ? ' for your household' : ''}${last ? '' : '; no change on record'}.`,
        e.id,
      ),
    );
  }
  return out;
}

/** Yearly coil cleaning or condensate drain service, sooner when the last visit recommended it. */
export function yearlyServiceDue(kind: 'coil_cleaning' | 'condensate_drain', h: HomeRecords, today: DateTime): DueItem | null {
  const kinds = kind === 'coil_cleaning' ? OUTDOOR_COIL_KINDS : DRAIN_KINDS;
  if (!h.equipment.some((e) => kinds.has(e.kind))) return null;
  const pattern = kind === 'coil_cleaning' ? /coil clean/i : /condensate|drain/i;
  const done = h.visits.filter((v) => v.status === 'done').sort((a, b) => a.startsAt.localeCompare(b.startsAt));
  const lastVisit = done.at(-1);
  // A tune-up cleans the coil and flushes the drain (common practice).
  const lastService = done.filter((v) => v.kind === 'tune_up').at(-1);
  const label = kind === 'coil_cleaning' ? 'Outdoor coil cleaning' : 'Condensate drain service';
  if (lastVisit && pattern.test(lastVisit.recommendations ?? '')) {
    return item(kind, label, local(lastVisit.startsAt, today).plus({ days: RECOMMENDED_SERVICE_DAYS }), today, 'Recommended at your last visit.');
  }
  const due = lastService ? local(lastService.startsAt, today).plus({ days: YEARLY_SERVICE_DAYS }) : today;
  return item(kind, label, due, today, lastService ? 'Once a year since your last tune-up.' : 'Once a year; none on record.');
}

/** The renewal notice the renewal engine would send today, if any: the same notice never comes twice. */
export function renewalDue(h: HomeRecords, today: DateTime): DueItem | null {
  const a = h.agreement;
  if (!a) return null;
  const notice: NoticeAgreement = { status: a.status as NoticeAgreement['status'], termEnd: a.termEnd, noticesSent: a.noticesSent };
  const due = renewalNoticesDue(notice, today.toISODate()!);
  if (!due.length) return null;
  const end = DateTime.fromISO(a.termEnd, { zone: today.zone });
  return item('renewal', 'Plan renewal', end.minus({ days: 1 }), today, `Your plan\u2019s last covered day is ${end.minus({ days: 1 }).toFormat('LLLL d')}.`);
}

/** Everything due within DUE_SOON_DAYS (or overdue), soonest first. */
export function dueItems(h: HomeRecords, today: DateTime, settings?: Partial<SeasonSettings> | null): DueItem[] {
  const all = [
    tuneUpDue('cooling', h, today, settings),
    tuneUpDue('heating', h, today, settings),
    ...filtersDue(h, today),
    yearlyServiceDue('coil_cleaning', h, today),
    yearlyServiceDue('condensate_drain', h, today),
    renewalDue(h, today),
  ].filter((x): x is DueItem => x !== null);
  return all.filter((i) => i.kind === 'renewal' || i.inDays <= DUE_SOON_DAYS).sort((a, b) => a.inDays - b.inDays || a.label.localeCompare(b.label));
}
