import { DateTime, IANAZone } from 'luxon';
import { toIso, WallClock, windowLabel, type LocalDate } from './clock';
import {
  clockMinutes,
  parseAvailabilityInput,
  SchedulingInputError,
  WEEKDAYS,
  instantSchema,
  type ArrivalWindow,
  type AvailabilityInput,
  type HoursInterval,
  type ParsedAvailabilityInput,
  type WeeklyHours,
} from './types';

const MINUTE = 60_000;

interface Span {
  start: number;
  end: number;
}

interface TechDay {
  id: string;
  shifts: Span[];
  /** Time off and booked visits widened by the travel buffer: a new visit may not overlap any. */
  blocked: Span[];
  bookedMinutes: number;
}

interface DayPlan {
  date: LocalDate;
  windows: Span[];
  techs: TechDay[];
  /** Technician-minutes in the day, and what ordinary bookings have already used. */
  capacityMinutes: number;
  ordinaryUsedMinutes: number;
  showZone: boolean;
}

interface Context {
  input: ParsedAvailabilityInput;
  zone: IANAZone;
  clock: WallClock;
  visitMs: number;
  bufferMs: number;
  earliestWindowStart: number;
  priority: boolean;
  bookedByTech: Map<string, Calendar>;
  ordinaryBooked: Calendar;
}

/** Visits in start order, each with its place in the input, for picking out one day's without a full scan. */
interface Calendar {
  spans: (Span & { at: number })[];
  longestMs: number;
}

function calendarOf(spans: Span[]): Calendar {
  const list = spans.map((s, at) => ({ ...s, at })).sort((a, b) => a.start - b.start || a.at - b.at);
  return { spans: list, longestMs: list.reduce((m, s) => Math.max(m, s.end - s.start), 0) };
}

/** First index whose start is at least `t`. */
function firstStartingFrom(list: Span[], t: number): number {
  let lo = 0;
  let hi = list.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (list[mid]!.start < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The visits that start in [from, before) and end after `endsAfter`, in input order (as a filter would give them). */
function picked(cal: Calendar | undefined, from: number, before: number, endsAfter: number): Span[] {
  if (!cal) return [];
  const out: (Span & { at: number })[] = [];
  for (let i = firstStartingFrom(cal.spans, from); i < cal.spans.length; i++) {
    const s = cal.spans[i]!;
    if (s.start >= before) break;
    if (s.end > endsAfter) out.push(s);
  }
  return out.sort((a, b) => a.at - b.at).map(({ start, end }) => ({ start, end }));
}

function weekdayOf(date: LocalDate): (typeof WEEKDAYS)[number] {
  // getUTCDay: 0 = Sunday; WEEKDAYS starts on Monday.
  return WEEKDAYS[(new Date(Date.UTC(date.year, date.month - 1, date.day)).getUTCDay() + 6) % 7]!;
}

function intervalsOn(hours: WeeklyHours, date: LocalDate): HoursInterval[] {
  return hours[weekdayOf(date)] ?? [];
}

function resolveInterval(clock: WallClock, date: LocalDate, h: HoursInterval): Span | null {
  const start = clock.opening(date, clockMinutes(h.open));
  const end = clock.closing(date, clockMinutes(h.close));
  return start < end ? { start, end } : null;
}

/** Arrival windows for one business-hours interval: consecutive spans between wall-clock boundaries. */
function windowsFor(clock: WallClock, date: LocalDate, h: HoursInterval, windowMinutes: number): Span[] {
  const open = clockMinutes(h.open);
  const close = clockMinutes(h.close);
  const marks = new Set<number>();
  for (let m = open; m < close; m += windowMinutes) {
    for (const t of clock.boundaries(date, m)) marks.add(t);
  }
  for (const t of clock.boundaries(date, close)) marks.add(t);
  const sorted = [...marks].sort((a, b) => a - b);
  const spans: Span[] = [];
  for (let i = 0; i + 1 < sorted.length; i++) spans.push({ start: sorted[i]!, end: sorted[i + 1]! });
  return spans;
}

function overlaps(a: Span, b: Span): boolean {
  return a.start < b.end && b.start < a.end;
}

function overlapMs(a: Span, b: Span): number {
  return Math.max(0, Math.min(a.end, b.end) - Math.max(a.start, b.start));
}

/** Merges overlapping spans so time off entered twice is not subtracted twice. */
function merged(spans: Span[]): Span[] {
  const out: Span[] = [];
  for (const s of [...spans].sort((a, b) => a.start - b.start)) {
    const last = out[out.length - 1];
    if (last && s.start <= last.end) last.end = Math.max(last.end, s.end);
    else out.push({ ...s });
  }
  return out;
}

function localDates(from: string, to: string): LocalDate[] {
  const out: LocalDate[] = [];
  let d = DateTime.fromISO(from, { zone: 'UTC' });
  const last = DateTime.fromISO(to, { zone: 'UTC' });
  while (d <= last) {
    out.push({ year: d.year, month: d.month, day: d.day });
    d = d.plus({ days: 1 });
  }
  return out;
}

/** The booked visits grouped once per search: each technician's, and those using the ordinary share. */
function calendars(booked: ParsedAvailabilityInput['booked']): Pick<Context, 'bookedByTech' | 'ordinaryBooked'> {
  const byTech = new Map<string, Span[]>();
  const ordinary: Span[] = [];
  for (const v of booked) {
    const span = { start: Date.parse(v.start), end: Date.parse(v.end) };
    const list = byTech.get(v.technicianId);
    if (list) list.push(span);
    else byTech.set(v.technicianId, [span]);
    if (!v.priority) ordinary.push({ ...span });
  }
  return { bookedByTech: new Map([...byTech].map(([id, spans]) => [id, calendarOf(spans)])), ordinaryBooked: calendarOf(ordinary) };
}

type Booked = ParsedAvailabilityInput['booked'];

interface CheckedCalendar {
  /** Each entry and its four fields as they were when checked, to know the calendar is unchanged. */
  seen: unknown[];
  booked: Booked;
  grouped: Pick<Context, 'bookedByTech' | 'ordinaryBooked'>;
}

// The same calendar array is handed in on every search while the schedule stays the same (the
// windows route keeps one per schedule version): its visits are checked and grouped once.
const checkedCalendars = new WeakMap<object, CheckedCalendar>();

function fieldsOf(booked: readonly unknown[]): unknown[] {
  const seen: unknown[] = new Array(booked.length * 5);
  booked.forEach((v, i) => {
    const r = (v ?? {}) as Record<string, unknown>;
    seen[i * 5] = v;
    seen[i * 5 + 1] = r.technicianId;
    seen[i * 5 + 2] = r.start;
    seen[i * 5 + 3] = r.end;
    seen[i * 5 + 4] = r.priority;
  });
  return seen;
}

function sameFields(a: unknown[], b: unknown[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** Parses the input; a calendar unchanged since it was last checked is not checked or grouped again. */
function parsedWithCalendar(raw: AvailabilityInput): { input: ParsedAvailabilityInput; grouped: Pick<Context, 'bookedByTech' | 'ordinaryBooked'> } {
  const list = (raw as { booked?: unknown }).booked;
  if (!Array.isArray(list)) {
    const input = parseAvailabilityInput(raw);
    return { input, grouped: calendars(input.booked) };
  }
  const seen = fieldsOf(list);
  const known = checkedCalendars.get(list);
  if (known && sameFields(known.seen, seen)) {
    // Valid visits add no problem of their own, so the rest reports exactly what the whole would.
    const rest = parseAvailabilityInput({ ...raw, booked: [] });
    return { input: { ...rest, booked: known.booked }, grouped: known.grouped };
  }
  const input = parseAvailabilityInput(raw);
  const grouped = calendars(input.booked);
  checkedCalendars.set(list, { seen, booked: input.booked, grouped });
  return { input, grouped };
}

function buildContext(raw: AvailabilityInput): Context {
  const { input, grouped } = parsedWithCalendar(raw);
  const { settings, request } = input;
  const zone = IANAZone.create(settings.timeZone);
  return {
    input,
    zone,
    clock: new WallClock(zone),
    visitMs: settings.visitMinutes[request.visitKind]! * MINUTE,
    bufferMs: settings.travelBufferMinutes * MINUTE,
    earliestWindowStart: Date.parse(request.now) + settings.leadTimeMinutes * MINUTE,
    priority: request.member || request.urgent,
    ...grouped,
  };
}

function planDay(ctx: Context, date: LocalDate): DayPlan {
  const { settings, technicians } = ctx.input;
  const windows = intervalsOn(settings.businessHours, date)
    .flatMap((h) => windowsFor(ctx.clock, date, h, settings.windowMinutes))
    .sort((a, b) => a.start - b.start);
  const day: Span = { start: ctx.clock.opening(date, 0), end: ctx.clock.closing(date, 1440) };
  // Anything that can touch a visit starting today: the day itself plus a visit length and buffer either side.
  const reach = ctx.visitMs + ctx.bufferMs;
  const near = (s: Span) => s.start < day.end + reach && day.start - reach < s.end;

  let capacityMinutes = 0;
  const techs: TechDay[] = technicians.map((t) => {
    const shifts = intervalsOn(t.weeklyHours, date)
      .map((h) => resolveInterval(ctx.clock, date, h))
      .filter((s): s is Span => s !== null);
    const off = merged(t.timeOff.map((r) => ({ start: Date.parse(r.start), end: Date.parse(r.end) })).filter(near));
    for (const s of shifts) {
      capacityMinutes += (s.end - s.start - off.reduce((sum, o) => sum + overlapMs(s, o), 0)) / MINUTE;
    }
    // near(v) over visits in start order: a start before day.end + reach and an end after day.start - reach.
    const cal = ctx.bookedByTech.get(t.id);
    const mine = cal ? picked(cal, day.start - reach - cal.longestMs, day.end + reach, day.start - reach) : [];
    const blocked = [...off, ...mine.map((v) => ({ start: v.start - ctx.bufferMs, end: v.end + ctx.bufferMs }))];
    const bookedMinutes = mine.reduce((sum, v) => sum + overlapMs(v, day), 0) / MINUTE;
    return { id: t.id, shifts, blocked, bookedMinutes };
  });

  // Each visit costs its time on site plus the drive to it.
  const ordinaryUsedMinutes = picked(ctx.ordinaryBooked, day.start, day.end, Number.NEGATIVE_INFINITY).reduce(
    (sum, v) => sum + (v.end - v.start) / MINUTE + settings.travelBufferMinutes,
    0,
  );

  return {
    date,
    windows,
    techs,
    capacityMinutes,
    ordinaryUsedMinutes,
    showZone: ctx.clock.offset(day.start) !== ctx.clock.offset(day.end - 1),
  };
}

/** Earliest start in [from, before) at which the visit fits the technician's shift and avoids every block. */
function earliestStart(tech: TechDay, blocked: Span[], from: number, before: number, visitMs: number): number | null {
  const candidates = [from, ...tech.shifts.map((s) => s.start), ...blocked.map((b) => b.end)].filter((t) => t >= from && t < before).sort((a, b) => a - b);
  for (const start of candidates) {
    const visit = { start, end: start + visitMs };
    const inShift = tech.shifts.some((s) => s.start <= visit.start && visit.end <= s.end);
    if (inShift && !blocked.some((b) => overlaps(b, visit))) return start;
  }
  return null;
}

/** How many visits of this length the technician could still start in the window, back to back. */
function startsInWindow(ctx: Context, tech: TechDay, w: Span): number[] {
  const blocked = [...tech.blocked];
  const starts: number[] = [];
  let from = w.start;
  for (;;) {
    const s = earliestStart(tech, blocked, from, w.end, ctx.visitMs);
    if (s === null) return starts;
    starts.push(s);
    blocked.push({ start: s - ctx.bufferMs, end: s + ctx.visitMs + ctx.bufferMs });
    from = s;
  }
}

/** Ordinary visits of this kind the day can still take before reaching the held-back share. */
function ordinaryAllowance(ctx: Context, day: DayPlan): number {
  if (ctx.priority) return Number.POSITIVE_INFINITY;
  const open = (1 - ctx.input.settings.heldBackShare) * day.capacityMinutes - day.ordinaryUsedMinutes;
  const perVisit = ctx.visitMs / MINUTE + ctx.input.settings.travelBufferMinutes;
  // Small epsilon so a share that divides evenly is not lost to floating point.
  return Math.max(0, Math.floor(open / perVisit + 1e-9));
}

function skilled(ctx: Context): Set<string> {
  const skill = ctx.input.request.requiredSkill;
  return new Set(ctx.input.technicians.filter((t) => !skill || t.skills.includes(skill)).map((t) => t.id));
}

interface WindowChoice {
  window: Span;
  day: DayPlan;
  capacity: number;
  starts: Map<string, number[]>;
}

function* windowChoices(ctx: Context): Generator<WindowChoice> {
  const able = skilled(ctx);
  for (const date of localDates(ctx.input.request.from, ctx.input.request.to)) {
    const day = planDay(ctx, date);
    const allowance = ordinaryAllowance(ctx, day);
    if (allowance === 0) continue;
    for (const w of day.windows) {
      if (w.start < ctx.earliestWindowStart) continue;
      const starts = new Map<string, number[]>();
      let physical = 0;
      for (const tech of day.techs) {
        if (!able.has(tech.id)) continue;
        const s = startsInWindow(ctx, tech, w);
        if (s.length > 0) {
          starts.set(tech.id, s);
          physical += s.length;
        }
      }
      const capacity = Math.min(physical, allowance);
      if (capacity > 0) yield { window: w, day, capacity, starts };
    }
  }
}

function promiseDeadline(ctx: Context): number | null {
  const { member, priorityPromiseHours, now } = ctx.input.request;
  if (!member || priorityPromiseHours === undefined) return null;
  return Date.parse(now) + priorityPromiseHours * 3_600_000;
}

function toArrivalWindow(ctx: Context, c: WindowChoice): ArrivalWindow {
  const tz = ctx.input.settings.timeZone;
  const deadline = promiseDeadline(ctx);
  return {
    start: toIso(c.window.start, tz),
    end: toIso(c.window.end, tz),
    localLabel: windowLabel(c.window.start, c.window.end, tz, c.day.showZone),
    capacity: c.capacity,
    technicianIds: [...c.starts.keys()].sort(),
    meetsPriorityPromise: deadline !== null && c.window.end <= deadline,
  };
}

/** Arrival windows the caller can book, in time order; each one really has a technician free. */
export function availableWindows(input: AvailabilityInput): ArrivalWindow[] {
  const ctx = buildContext(input);
  return [...windowChoices(ctx)].map((c) => toArrivalWindow(ctx, c));
}

/**
 * A member's plan promises a technician arrives within `promiseHours` of the call:
 * the whole arrival window must close by then.
 */
export function meetsPriorityPromise(window: { end: string }, now: string, promiseHours: number): boolean {
  const end = Date.parse(window.end);
  const from = Date.parse(now);
  if (Number.isNaN(end)) throw new SchedulingInputError('window.end', 'must be an ISO date-time');
  if (Number.isNaN(from)) throw new SchedulingInputError('now', 'must be an ISO date-time');
  if (!Number.isFinite(promiseHours) || promiseHours <= 0) {
    throw new SchedulingInputError('promiseHours', 'must be a positive number of hours');
  }
  return end <= from + promiseHours * 3_600_000;
}

export interface PlannedVisit {
  technicianId: string;
  start: string;
  end: string;
  window: ArrivalWindow;
}

export type BookingPlan = { ok: true; visit: PlannedVisit } | { ok: false; reason: 'window_full'; alternatives: ArrivalWindow[] };

/**
 * Picks the technician and exact start for a booking in the chosen window (identified by its start).
 * Earliest arrival wins; ties go to the technician with the lighter day, then by id.
 */
export function planBooking(input: AvailabilityInput, windowStart: string): BookingPlan {
  const parsedStart = instantSchema.safeParse(windowStart);
  if (!parsedStart.success) throw new SchedulingInputError('windowStart', 'must be an ISO date-time with offset');
  const wanted = Date.parse(windowStart);
  const ctx = buildContext(input);
  for (const c of windowChoices(ctx)) {
    if (c.window.start !== wanted) continue;
    const load = new Map(c.day.techs.map((t) => [t.id, t.bookedMinutes]));
    const [technicianId, starts] = [...c.starts.entries()].sort(([ia, sa], [ib, sb]) => sa[0]! - sb[0]! || load.get(ia)! - load.get(ib)! || ia.localeCompare(ib))[0]!;
    const start = starts[0]!;
    const tz = ctx.input.settings.timeZone;
    return {
      ok: true,
      visit: {
        technicianId,
        start: toIso(start, tz),
        end: toIso(start + ctx.visitMs, tz),
        window: toArrivalWindow(ctx, c),
      },
    };
  }
  return { ok: false, reason: 'window_full', alternatives: nextFreeWindows(input, { after: windowStart }) };
}

export interface NextFreeOptions {
  /** Only windows starting strictly after this instant, e.g. the one that just filled (default: `now`). */
  after?: string;
  /** How many to return (default 3). */
  count?: number;
  /** How far past `after` to look, in days (default 14). */
  searchDays?: number;
}

/** The next few free windows, for "that window just filled: how about one of these?". */
export function nextFreeWindows(input: AvailabilityInput, options: NextFreeOptions = {}): ArrivalWindow[] {
  const base = parseAvailabilityInput(input);
  const after = options.after ?? base.request.now;
  if (!instantSchema.safeParse(after).success) {
    throw new SchedulingInputError('after', 'must be an ISO date-time with offset');
  }
  const count = options.count ?? 3;
  const searchDays = options.searchDays ?? 14;
  if (!Number.isInteger(count) || count < 1) throw new SchedulingInputError('count', 'must be a whole number of at least 1');
  if (!Number.isInteger(searchDays) || searchDays < 1 || searchDays > 62) {
    throw new SchedulingInputError('searchDays', 'must be a whole number of days from 1 to 62');
  }
  const tz = base.settings.timeZone;
  const afterMs = Date.parse(after);
  const startDate = DateTime.fromMillis(Math.max(afterMs, Date.parse(base.request.now)), { zone: tz });
  const ctx = buildContext({
    ...input,
    request: {
      ...input.request,
      from: startDate.toISODate()!,
      to: startDate.plus({ days: searchDays }).toISODate()!,
    },
  });
  const out: ArrivalWindow[] = [];
  for (const c of windowChoices(ctx)) {
    if (c.window.start <= afterMs) continue;
    out.push(toArrivalWindow(ctx, c));
    if (out.length === count) break;
  }
  return out;
}
