import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import {
  FILTER_FACTOR_SHARE,
  MIN_FILTER_DAYS,
  dueItems,
  dueWords,
  filterIntervalFor,
  filterSizeLabel,
  filtersDue,
  renewalDue,
  seasonWindow,
  tuneUpDue,
  yearlyServiceDue,
  type HomeRecords,
} from '../shared/reminders';
import { filterCategory } from '../shared/service-life';

const ZONE = 'America/Chicago';
const day = (iso: string) => DateTime.fromISO(iso, { zone: ZONE });
const plan = { status: 'active', coolingVisits: 1, heatingVisits: 1, termEnd: '2027-06-01', noticesSent: [] as const };
const home = (over: Partial<HomeRecords> = {}): HomeRecords => ({ factors: [], agreement: plan, equipment: [], visits: [], filterChanges: {}, ...over });
const unit = (kind: string, filterSize = '', filterType = '') => ({ id: `${kind}-1`, kind, filterSize, filterType });

describe('filter intervals by filter type', () => {
  it('each filter type has its own interval', () => {
    // Common practice (filter makers' packaging): fiberglass panels about monthly.
    expect(filterIntervalFor(filterCategory('16x25x1', 'fiberglass'), [])).toBe(30);
    // ENERGY STAR maintenance checklist: change a 1-inch filter at least every 3 months.
    expect(filterIntervalFor(filterCategory('16x25x1', 'pleated'), [])).toBe(90);
    // Common practice: a 2-inch pleated filter about every 3 months.
    expect(filterIntervalFor(filterCategory('20x25x2'), [])).toBe(90);
    // Common practice (media cabinet makers' instructions): 6 to 12 months; we remind at 6.
    expect(filterIntervalFor(filterCategory('20x25x4'), [])).toBe(180);
    expect(filterIntervalFor(filterCategory('20x25x5', 'media'), [])).toBe(180);
  });

  it('household factors shorten the interval, several multiply, never below the floor', () => {
    // Common practice: pets take a 90-day pleated filter to about 60 days.
    expect(filterIntervalFor('one_inch_pleated', ['pets'])).toBe(60);
    expect(filterIntervalFor('one_inch_pleated', ['allergies'])).toBe(60);
    expect(filterIntervalFor('one_inch_pleated', ['smokers'])).toBe(45);
    expect(filterIntervalFor('one_inch_pleated', ['renovation_dust'])).toBe(30);
    expect(filterIntervalFor('one_inch_pleated', ['pets', 'allergies'])).toBe(40);
    expect(filterIntervalFor('one_inch_fiberglass', ['pets', 'smokers', 'renovation_dust'])).toBe(MIN_FILTER_DAYS);
    expect(filterIntervalFor('media_4_5_inch', ['pets', 'pets'])).toBe(120);
    for (const f of Object.values(FILTER_FACTOR_SHARE)) expect(f.source).toMatch(/common practice|from memory|ENERGY STAR/i);
  });

  it('counts from the later of the last visit and the homeowner pressing "I changed it"', () => {
    const today = day('2026-06-10');
    const h = home({
      equipment: [unit('gas_furnace', '16x25x1', 'pleated')],
      visits: [{ kind: 'tune_up', status: 'done', startsAt: '2026-03-01T15:00:00Z' }],
    });
    expect(filtersDue(h, today)[0]).toMatchObject({ label: 'Filter (16×25×1)', dueOn: '2026-05-30', inDays: -11 });
    const changed = { ...h, filterChanges: { 'gas_furnace-1': '2026-06-05T14:00:00Z' } };
    expect(filtersDue(changed, today)[0]).toMatchObject({ dueOn: '2026-09-03', inDays: 85 });
    // Nothing on record: due today.
    expect(filtersDue(home({ equipment: [unit('air_handler', '20x25x4')] }), today)[0]).toMatchObject({ inDays: 0 });
  });

  it('reads as the homeowner would', () => {
    expect(filterSizeLabel('16x25x1')).toBe('16×25×1');
    expect(dueWords(5)).toBe('due in 5 days');
    expect(dueWords(0)).toBe('due today');
    expect(dueWords(-1)).toBe('1 day overdue');
  });
});

describe('tune-ups and the season table in the company time zone', () => {
  it('season boundaries fall at local midnight, not UTC', () => {
    // 03:30 UTC on 1 September is still 31 August in Chicago: cooling season (March–August by default).
    const lateAugust = DateTime.fromISO('2026-09-01T03:30:00Z').setZone(ZONE);
    expect(seasonWindow('heating', lateAugust).start.toISODate()).toBe('2026-09-01');
    expect(seasonWindow('cooling', lateAugust).start.toISODate()).toBe('2026-03-01');
    const september = DateTime.fromISO('2026-09-01T05:30:00Z').setZone(ZONE);
    expect(seasonWindow('cooling', september).start.toISODate()).toBe('2027-03-01');
    // Heating runs over New Year: February still belongs to the season that began in September.
    expect(seasonWindow('heating', day('2027-02-10')).start.toISODate()).toBe('2026-09-01');
    expect(seasonWindow('heating', day('2027-02-10')).end.toISODate()).toBe('2027-02-28');
    // The owner's own months.
    expect(seasonWindow('cooling', day('2026-04-10'), { coolingStartMonth: 5, heatingStartMonth: 10 }).start.toISODate()).toBe('2026-05-01');
  });

  it('a heat pump gets both tune-ups; a furnace alone only the heating one', () => {
    const today = day('2026-08-20');
    const hp = home({ equipment: [unit('heat_pump')] });
    expect(tuneUpDue('cooling', hp, today)).not.toBeNull();
    expect(tuneUpDue('heating', hp, today)).toMatchObject({ kind: 'heating_tune_up', dueOn: '2026-09-01', inDays: 12 });
    const furnace = home({ equipment: [unit('gas_furnace')] });
    expect(tuneUpDue('cooling', furnace, today)).toBeNull();
    expect(tuneUpDue('heating', furnace, today)).not.toBeNull();
  });

  it('no reminder for a tune-up already booked, or a plan without it', () => {
    const today = day('2026-09-15');
    const booked = home({ equipment: [unit('heat_pump')], visits: [{ kind: 'tune_up', status: 'scheduled', startsAt: '2026-10-02T14:00:00Z' }] });
    expect(tuneUpDue('heating', booked, today)).toBeNull();
    // Booked in late August counts for the fall season (within the early-booking days).
    expect(tuneUpDue('heating', home({ visits: [{ kind: 'tune_up', status: 'scheduled', startsAt: '2026-08-20T14:00:00Z' }] }), today)).toBeNull();
    // A cancelled booking does not.
    expect(tuneUpDue('heating', home({ visits: [{ kind: 'tune_up', status: 'canceled', startsAt: '2026-10-02T14:00:00Z' }] }), today)).not.toBeNull();
    expect(tuneUpDue('heating', home({ agreement: { ...plan, heatingVisits: 0 } }), today)).toBeNull();
    expect(tuneUpDue('heating', home({ agreement: null }), today)).toBeNull();
  });
});

describe('yearly coil and drain service, and renewals', () => {
  const today = day('2026-07-01');
  it('yearly from the last tune-up, sooner when the last visit recommended it', () => {
    const ac = [unit('condensing_unit'), unit('air_handler')];
    const last = { kind: 'tune_up', status: 'done', startsAt: '2026-04-01T15:00:00Z' };
    expect(yearlyServiceDue('coil_cleaning', home({ equipment: ac, visits: [last] }), today)).toMatchObject({ dueOn: '2027-04-01' });
    const recommended = { ...last, recommendations: 'Outdoor coil cleaning: cottonwood on the fins' };
    expect(yearlyServiceDue('coil_cleaning', home({ equipment: ac, visits: [recommended] }), today)).toMatchObject({ dueOn: '2026-05-01', why: 'Recommended at your last visit.' });
    const drain = { ...last, recommendations: 'Flush the condensate drain; algae in the trap' };
    expect(yearlyServiceDue('condensate_drain', home({ equipment: ac, visits: [drain] }), today)).toMatchObject({ dueOn: '2026-05-01' });
    expect(yearlyServiceDue('coil_cleaning', home({ equipment: [unit('gas_furnace')] }), today)).toBeNull();
  });

  it('a renewal notice comes from the renewal engine and never twice', () => {
    const ending = home({ agreement: { ...plan, termEnd: '2026-07-25', noticesSent: [] } });
    expect(renewalDue(ending, today)).toMatchObject({ kind: 'renewal', dueOn: '2026-07-24' });
    expect(renewalDue(home({ agreement: { ...plan, termEnd: '2026-07-25', noticesSent: [30] } }), today)).toBeNull();
    expect(dueItems(ending, today).map((i) => i.kind)).toContain('renewal');
  });
});
