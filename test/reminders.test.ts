import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { reminderDecision, seasonOf, type ReminderHousehold } from '../shared/seasonal-reminders';

const zone = 'America/Chicago';
const day = (iso: string) => DateTime.fromISO(iso, { zone });
const plan = { status: 'active', coolingVisits: 1, heatingVisits: 1, extras: [] as string[] };
const household = (over: Partial<ReminderHousehold> = {}): ReminderHousehold => ({
  customerId: 'c1',
  email: 'home@example.test',
  agreement: plan,
  visits: [],
  equipment: [
    { kind: 'condensing_unit', filterSize: '' },
    { kind: 'gas_furnace', filterSize: '16x25x1' },
  ],
  lastSent: {},
  ...over,
});

describe('seasons', () => {
  // The one season table (shared/seasons.ts): by default cooling March–August, heating September–February
  // (common practice: cool in spring, heat in fall), the same months coverage and checklists use.
  it('points at the coming cooling season once this year’s has ended', () => {
    const s = seasonOf('cooling', day('2026-12-01'));
    expect(s.start.toISODate()).toBe('2027-03-01');
    expect(s.end.toISODate()).toBe('2027-08-31');
  });
  it('stays in the current heating season while it runs, over New Year', () => {
    const s = seasonOf('heating', day('2026-09-15'));
    expect(s.start.toISODate()).toBe('2026-09-01');
    expect(s.end.toISODate()).toBe('2027-02-28');
    expect(seasonOf('heating', day('2027-01-20')).start.toISODate()).toBe('2026-09-01');
  });
  it('follows the owner’s months', () => {
    const s = seasonOf('cooling', day('2026-04-10'), { coolingStartMonth: 5, heatingStartMonth: 10 });
    expect(s.start.toISODate()).toBe('2026-05-01');
    expect(s.end.toISODate()).toBe('2026-09-30');
  });
});

describe('tune-up reminders', () => {
  it('are due for a plan member with nothing booked this season', () => {
    expect(reminderDecision('cooling_tune_up', household(), day('2027-02-10')).due).toBe(true);
  });
  it('are not due when a tune-up is already booked in the season', () => {
    const h = household({ visits: [{ kind: 'tune_up', status: 'scheduled', startsAt: '2027-04-02T14:00:00Z' }] });
    expect(reminderDecision('cooling_tune_up', h, day('2027-02-10'))).toMatchObject({ due: false });
  });
  it('ignore a canceled tune-up', () => {
    const h = household({ visits: [{ kind: 'tune_up', status: 'canceled', startsAt: '2027-04-02T14:00:00Z' }] });
    expect(reminderDecision('cooling_tune_up', h, day('2027-02-10')).due).toBe(true);
  });
  it('are not sent without a plan in force, or without an address', () => {
    expect(reminderDecision('heating_tune_up', household({ agreement: { ...plan, status: 'lapsed' } }), day('2026-08-10')).due).toBe(false);
    expect(reminderDecision('heating_tune_up', household({ email: null }), day('2026-08-10')).due).toBe(false);
  });
  it('are not repeated within 30 days', () => {
    const h = household({ lastSent: { cooling_tune_up: '2027-02-01T15:00:00Z' } });
    expect(reminderDecision('cooling_tune_up', h, day('2027-02-10')).due).toBe(false);
    expect(reminderDecision('cooling_tune_up', h, day('2027-03-15')).due).toBe(true);
  });
});

describe('filter and coil reminders', () => {
  it('are due every 90 days for a 1-inch filter and every 180 for a 4-inch media filter (common practice)', () => {
    const visit = [{ kind: 'tune_up', status: 'done', startsAt: '2026-05-01T15:00:00Z' }];
    expect(reminderDecision('filter', household({ visits: visit }), day('2026-07-01')).due).toBe(false);
    expect(reminderDecision('filter', household({ visits: visit }), day('2026-08-15')).due).toBe(true);
    const media = household({ visits: visit, equipment: [{ kind: 'gas_furnace', filterSize: '20x25x4' }] });
    expect(reminderDecision('filter', media, day('2026-08-15')).due).toBe(false);
    expect(reminderDecision('filter', media, day('2026-11-15')).due).toBe(true);
  });
  it('go by filter type, and read a size written with its unit', () => {
    // 1-inch fiberglass monthly (common practice); "16x25x4 in" is a 4-inch media filter, every 180 days (common practice).
    const visit = [{ kind: 'tune_up', status: 'done', startsAt: '2026-05-01T15:00:00Z' }];
    const fiberglass = household({ visits: visit, equipment: [{ kind: 'gas_furnace', filterSize: '16x25x1', filterType: 'Fiberglass' }] });
    expect(reminderDecision('filter', fiberglass, day('2026-05-20')).due).toBe(false);
    expect(reminderDecision('filter', fiberglass, day('2026-06-05')).due).toBe(true);
    const media = household({ visits: visit, equipment: [{ kind: 'gas_furnace', filterSize: '16x25x4 in' }] });
    expect(reminderDecision('filter', media, day('2026-08-15')).due).toBe(false);
    expect(reminderDecision('filter', media, day('2026-11-15')).due).toBe(true);
  });
  it('need a filter size on file', () => {
    expect(reminderDecision('filter', household({ equipment: [{ kind: 'thermostat', filterSize: '' }] }), day('2026-08-15')).due).toBe(false);
  });
  it('suggest coil cleaning only where a technician recommended it or the plan includes it', () => {
    expect(reminderDecision('coil_cleaning', household(), day('2026-04-01')).due).toBe(false);
    const recommended = household({
      visits: [{ kind: 'service_call', status: 'done', startsAt: '2025-09-01T15:00:00Z', recommendations: 'Coil cleaning recommended before next summer.' }],
    });
    expect(reminderDecision('coil_cleaning', recommended, day('2026-04-01')).due).toBe(true);
    const included = household({ agreement: { ...plan, extras: ['Outdoor coil cleaning once a year'] } });
    expect(reminderDecision('coil_cleaning', included, day('2026-04-01')).due).toBe(true);
    expect(
      reminderDecision(
        'coil_cleaning',
        household({ agreement: { ...plan, extras: ['Outdoor coil cleaning once a year'] }, equipment: [{ kind: 'gas_furnace', filterSize: '16x25x1' }] }),
        day('2026-04-01'),
      ).due,
    ).toBe(false);
  });
});
