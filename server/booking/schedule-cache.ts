import { DateTime } from 'luxon';
import { availableWindows, type ArrivalWindow, type AvailabilityInput } from '../../shared/scheduling';
import type { Db } from '../db/client';
import { loadCompanySettings, loadSchedulingData, type CompanySettings, type SchedulingData } from './scheduling-input';

/**
 * What the windows route derives from the schedule, kept per process while the schedule's version
 * stays the same. Triggers bump the version in the same transaction as every write that changes
 * who is free when, so checking it (read in the same statement as the property) is enough for
 * several processes to stay correct. Booking itself never reads from here: it re-reads inside its day lock.
 */
interface Snapshot {
  version: number;
  from: number;
  to: number;
  company: CompanySettings;
  data: SchedulingData;
  windows: Map<string, ArrivalWindow[]>;
}

// A snapshot covers at least this many days from the first date asked, so a fortnight's offers and
// the next weeks' all come from one read of the schedule.
const SNAPSHOT_DAYS = 45;
// Distinct window answers kept per version (properties differ by skill, membership and promise).
const MAX_ANSWERS = 500;

const snapshots = new WeakMap<Db, Snapshot>();

/**
 * The company's settings and the schedule over the range `rangeIn` gives in the company's zone,
 * from this process's snapshot while `version` is current. The caller reads the version before
 * anything else (a write committed in between only makes the data newer than its label, and the
 * next read sees the bumped version and loads again). A company change bumps the version too, so a
 * current snapshot's settings are current.
 */
export async function scheduleSnapshot(db: Db, rangeIn: (timeZone: string) => { from: Date; to: Date }, version: number): Promise<Snapshot> {
  const have = snapshots.get(db);
  const current = have && have.version === version ? have : undefined;
  if (current) {
    const range = rangeIn(current.company.timeZone);
    if (current.from <= range.from.getTime() && current.to >= range.to.getTime()) return current;
  }
  const company = current?.company ?? (await loadCompanySettings(db));
  const range = rangeIn(company.timeZone);
  const from = range.from;
  const to = new Date(Math.max(range.to.getTime(), from.getTime() + SNAPSHOT_DAYS * 86_400_000));
  const data = await loadSchedulingData(db, { from, to });
  const snap: Snapshot = { version, from: from.getTime(), to: to.getTime(), company, data, windows: new Map() };
  snapshots.set(db, snap);
  return snap;
}

/** The schedule data narrowed to a range, so the engine replays only the days it is asked about. */
export function within(data: SchedulingData, range: { from: Date; to: Date }): SchedulingData {
  const a = range.from.toISOString();
  const b = range.to.toISOString();
  const overlaps = (x: { start: string; end: string }) => x.start < b && x.end > a;
  return {
    names: data.names,
    technicians: data.technicians.map((t) => ({ ...t, timeOff: t.timeOff?.filter(overlaps) })),
    booked: data.booked.filter(overlaps),
  };
}

/**
 * The engine's windows for one input over the snapshot's whole schedule, answered once per snapshot
 * and input; the schedule is narrowed to `range` (the days the request covers) only to answer anew.
 */
export function cachedWindows(snap: Snapshot, input: AvailabilityInput, range: { from: Date; to: Date }): ArrivalWindow[] {
  const key = JSON.stringify([input.request, input.technicians.length]);
  const hit = snap.windows.get(key);
  if (hit) return hit;
  const narrowed = within(snap.data, range);
  const windows = availableWindows({ ...input, technicians: narrowed.technicians, booked: narrowed.booked });
  if (snap.windows.size >= MAX_ANSWERS) snap.windows.clear();
  snap.windows.set(key, windows);
  return windows;
}

/**
 * "Now" for cached answers: the next whole minute, so calls within a minute share one answer. Later
 * than the real now, so the lead time only ever drops a window early, never offers one too soon.
 */
export function minuteAfter(now: Date): Date {
  const t = DateTime.fromJSDate(now);
  const floor = t.startOf('minute');
  return (floor.equals(t) ? floor : floor.plus({ minutes: 1 })).toJSDate();
}
