import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  availableWindows,
  meetsPriorityPromise,
  nextFreeWindows,
  planBooking,
  SchedulingInputError,
  type AvailabilityInput,
  type BookedVisit,
  type SchedulingSettings,
  type Technician,
} from '../shared/scheduling';

// Figures below are worked out by hand from the configured hours, durations and shares.
// Tue 14 Jul 2026 in America/Chicago is on daylight time, UTC-05:00 (IANA tz database, US rule since 2007).
const TZ = 'America/Chicago';
const weekday = [{ open: '08:00', close: '17:00' }];

const settings: SchedulingSettings = {
  timeZone: TZ,
  businessHours: { mon: weekday, tue: weekday, wed: weekday, thu: weekday, fri: weekday, sat: [{ open: '08:00', close: '12:00' }] },
  // Tune-up 90 min and no-cooling call 120 min are common practice for a residential split system.
  visitMinutes: { tune_up: 90, no_cooling: 120 },
  travelBufferMinutes: 30,
  leadTimeMinutes: 120,
  heldBackShare: 0.25,
  windowMinutes: 120,
};

function tech(id: string, extra: Partial<Technician> = {}): Technician {
  return { id, weeklyHours: { mon: weekday, tue: weekday, wed: weekday, thu: weekday, fri: weekday }, ...extra };
}

function at(clock: string, date = '2026-07-14'): string {
  return `${date}T${clock}:00-05:00`;
}

function input(
  over: {
    settings?: Partial<SchedulingSettings>;
    technicians?: Technician[];
    booked?: BookedVisit[];
    request?: Partial<AvailabilityInput['request']>;
  } = {},
): AvailabilityInput {
  return {
    settings: { ...settings, ...over.settings },
    technicians: over.technicians ?? [tech('ana')],
    booked: over.booked ?? [],
    request: {
      visitKind: 'tune_up',
      member: false,
      urgent: false,
      from: '2026-07-14',
      to: '2026-07-14',
      now: '2026-07-01T12:00:00-05:00',
      ...over.request,
    },
  };
}

const starts = (i: AvailabilityInput) => availableWindows(i).map((w) => w.start);

describe('business hours', () => {
  it('cuts two-hour arrival windows from opening to closing, labelled in local time', () => {
    const ws = availableWindows(input({ technicians: [tech('ana', { weeklyHours: { tue: [{ open: '07:00', close: '19:00' }] } })] }));
    expect(ws.map((w) => [w.start, w.end])).toEqual([
      [at('08:00'), at('10:00')],
      [at('10:00'), at('12:00')],
      [at('12:00'), at('14:00')],
      [at('14:00'), at('16:00')],
      // Shorter last window: business hours close at 17:00; the technician works on to finish.
      [at('16:00'), at('17:00')],
    ]);
    expect(ws.map((w) => w.localLabel)).toEqual(['Tue 14 Jul, 8–10 am', 'Tue 14 Jul, 10 am–12 pm', 'Tue 14 Jul, 12–2 pm', 'Tue 14 Jul, 2–4 pm', 'Tue 14 Jul, 4–5 pm']);
  });

  it('offers Saturday morning only and nothing on a closed Sunday', () => {
    const all = { weeklyHours: { sat: [{ open: '08:00', close: '12:00' }], sun: [{ open: '08:00', close: '12:00' }] } };
    const ws = availableWindows(input({ technicians: [tech('ana', all)], request: { from: '2026-07-18', to: '2026-07-19' } }));
    expect(ws.map((w) => w.localLabel)).toEqual(['Sat 18 Jul, 8–10 am', 'Sat 18 Jul, 10 am–12 pm']);
  });

  it('needs the whole visit inside the technician’s shift', () => {
    const shortDay = [tech('ana', { weeklyHours: { tue: [{ open: '08:00', close: '11:30' }] } })];
    expect(starts(input({ technicians: shortDay }))).toEqual([at('08:00'), at('10:00')]); // 10:00 + 90 min = 11:30
    expect(starts(input({ technicians: shortDay, request: { visitKind: 'no_cooling' } }))).toEqual([at('08:00')]); // 10:00 + 120 > 11:30
  });

  it('counts how many visits can still start in a window, back to back with the drive between', () => {
    const wide = { settings: { windowMinutes: 240 }, request: { member: true } };
    // 08:00 and 10:00 starts: 90 min on site + 30 min drive = 120 min apart.
    expect(availableWindows(input(wide))[0]).toMatchObject({ start: at('08:00'), end: at('12:00'), capacity: 2 });
    expect(availableWindows(input({ ...wide, technicians: [tech('ana'), tech('ben')] }))[0]!.capacity).toBe(4);
  });
});

describe('time off', () => {
  it('removes the hours off and lets a visit start right when the technician is back', () => {
    const off = tech('ana', { timeOff: [{ start: at('10:00'), end: at('13:00') }] });
    expect(starts(input({ technicians: [off] }))).toEqual([at('08:00'), at('12:00'), at('14:00')]);
    const plan = planBooking(input({ technicians: [off] }), at('12:00'));
    expect(plan).toMatchObject({ ok: true, visit: { technicianId: 'ana', start: at('13:00'), end: at('14:30') } });
  });

  it('a whole day off leaves nothing', () => {
    const off = tech('ana', { timeOff: [{ start: '2026-07-14T00:00:00-05:00', end: '2026-07-15T00:00:00-05:00' }] });
    expect(availableWindows(input({ technicians: [off] }))).toEqual([]);
  });
});

describe('booked visits and the travel buffer', () => {
  const booked: BookedVisit[] = [{ technicianId: 'ana', start: at('10:00'), end: at('11:30') }];

  it('keeps the drive time clear on both sides of a booked visit', () => {
    // 08:00 visit ends 09:30, drive until 10:00: fits. Next start 11:30 + 30 = 12:00, outside 10–12.
    expect(starts(input({ booked }))).toEqual([at('08:00'), at('12:00'), at('14:00')]);
  });

  it('a longer buffer closes the window before and pushes the next start', () => {
    const i = input({ booked, settings: { travelBufferMinutes: 45 } });
    expect(starts(i)).toEqual([at('12:00'), at('14:00')]); // 09:30 + 45 > 10:00
    expect(planBooking(i, at('12:00'))).toMatchObject({ ok: true, visit: { start: at('12:15') } });
  });

  it('a booked visit takes that technician out of the window, not the others', () => {
    const two = [tech('ana'), tech('ben')];
    const b: BookedVisit[] = [{ technicianId: 'ana', start: at('08:00'), end: at('09:30') }];
    const first = availableWindows(input({ technicians: two, booked: b }))[0]!;
    expect(first).toMatchObject({ start: at('08:00'), capacity: 1, technicianIds: ['ben'] });
  });

  it('a planned booking, once inserted, is no longer offered', () => {
    const two = [tech('ana'), tech('ben')];
    const i = input({ technicians: two, request: { member: true } });
    const before = availableWindows(i)[0]!;
    const plan = planBooking(i, before.start);
    if (!plan.ok) throw new Error('expected a plan');
    const after = availableWindows({ ...i, booked: [{ technicianId: plan.visit.technicianId, start: plan.visit.start, end: plan.visit.end }] })[0]!;
    expect(before.capacity).toBe(2);
    expect(after).toMatchObject({ start: before.start, capacity: 1 });
    expect(after.technicianIds).not.toContain(plan.visit.technicianId);
  });
});

describe('lead time', () => {
  it('offers no window that starts sooner than now plus the lead time', () => {
    const now = '2026-07-14T07:30:00-05:00';
    expect(starts(input({ request: { now } }))[0]).toBe(at('10:00')); // 07:30 + 2 h = 09:30 > 08:00
    expect(starts(input({ request: { now }, settings: { leadTimeMinutes: 150 } }))[0]).toBe(at('10:00')); // exactly 10:00 is allowed
    expect(starts(input({ request: { now }, settings: { leadTimeMinutes: 151 } }))[0]).toBe(at('12:00'));
  });
});

describe('skills', () => {
  const crew = [tech('ana', { skills: ['gas_furnace'] }), tech('ben', { skills: ['geothermal', 'gas_furnace'] })];

  it('only technicians with the required skill can take the window', () => {
    const ws = availableWindows(input({ technicians: crew, request: { requiredSkill: 'geothermal' } }));
    expect(ws.length).toBeGreaterThan(0);
    for (const w of ws) expect(w).toMatchObject({ technicianIds: ['ben'], capacity: 1 });
    expect(availableWindows(input({ technicians: crew, request: { requiredSkill: 'gas_furnace' } }))[0]!.technicianIds).toEqual(['ana', 'ben']);
    expect(availableWindows(input({ technicians: crew, request: { requiredSkill: 'boiler' } }))).toEqual([]);
  });
});

describe('held-back capacity for plan members and urgent calls', () => {
  it('an ordinary caller sees less capacity than a member or an urgent call', () => {
    // Two technicians × 540 min = 1080; ordinary may use 75 % = 810 min; a tune-up costs 90 + 30 = 120 → 6.
    // Physically each technician can start 4 in 08:00–17:00 (08, 10, 12, 14; a 16:00 start would end 17:30).
    const day = { technicians: [tech('ana'), tech('ben')], settings: { windowMinutes: 540 } };
    expect(availableWindows(input(day))[0]!.capacity).toBe(6);
    expect(availableWindows(input({ ...day, request: { member: true } }))[0]!.capacity).toBe(8);
    expect(availableWindows(input({ ...day, request: { urgent: true } }))[0]!.capacity).toBe(8);
  });

  it('once ordinary bookings reach the share, only members and urgent calls get the rest of the day', () => {
    // One technician: 540 min, ordinary 405. Three ordinary tune-ups use 3 × 120 = 360; 45 left < 120.
    const booked: BookedVisit[] = [
      { technicianId: 'ana', start: at('08:00'), end: at('09:30') },
      { technicianId: 'ana', start: at('10:00'), end: at('11:30') },
      { technicianId: 'ana', start: at('12:00'), end: at('13:30') },
    ];
    expect(availableWindows(input({ booked }))).toEqual([]);
    expect(starts(input({ booked, request: { member: true } }))).toEqual([at('14:00')]);
    expect(starts(input({ booked, request: { urgent: true } }))).toEqual([at('14:00')]);
    // With two booked, 405 − 240 = 165 leaves room for exactly one more ordinary visit.
    const two = booked.slice(0, 2);
    expect(availableWindows(input({ booked: two })).map((w) => [w.start, w.capacity])).toEqual([
      [at('12:00'), 1],
      [at('14:00'), 1],
    ]);
  });

  it('visits booked for members or urgent calls do not use up the ordinary share', () => {
    const booked: BookedVisit[] = [
      { technicianId: 'ana', start: at('08:00'), end: at('09:30'), priority: true },
      { technicianId: 'ana', start: at('10:00'), end: at('11:30'), priority: true },
      { technicianId: 'ana', start: at('12:00'), end: at('13:30'), priority: true },
    ];
    expect(starts(input({ booked }))).toEqual([at('14:00')]);
  });

  it('time off entered twice is only taken out of the day once', () => {
    // 540 − 120 min off = 420; ordinary 75 % = 315 → 2 tune-ups of 120. Physically 10:00, 12:00, 14:00 → 3.
    const off = { start: at('08:00'), end: at('10:00') };
    const day = { technicians: [tech('ana', { timeOff: [off, { ...off }] })], settings: { windowMinutes: 540 } };
    expect(availableWindows(input(day))[0]!.capacity).toBe(2);
    expect(availableWindows(input({ ...day, request: { member: true } }))[0]!.capacity).toBe(3);
  });

  it('holding nothing back gives ordinary callers the full day', () => {
    const day = { technicians: [tech('ana'), tech('ben')], settings: { windowMinutes: 540, heldBackShare: 0 } };
    expect(availableWindows(input(day))[0]!.capacity).toBe(8);
  });
});

describe('priority promise', () => {
  it('marks windows that close within the member’s promised hours', () => {
    const now = '2026-07-14T07:00:00-05:00';
    const req = { member: true, now, to: '2026-07-15', priorityPromiseHours: 24 };
    const ws = availableWindows(input({ request: req, settings: { leadTimeMinutes: 60 } }));
    const promised = ws.filter((w) => w.meetsPriorityPromise).map((w) => w.start);
    // Deadline Wed 15 Jul 07:00: every Tuesday window ends before it, Wednesday’s first ends 10:00.
    expect(promised).toEqual([at('08:00'), at('10:00'), at('12:00'), at('14:00')]);
    expect(ws.some((w) => w.start.startsWith('2026-07-15'))).toBe(true);
    const ordinary = availableWindows(input({ request: { ...req, member: false } }));
    expect(ordinary.every((w) => !w.meetsPriorityPromise)).toBe(true);
  });

  it('the helper is exact at the deadline', () => {
    const now = '2026-07-14T10:00:00-05:00';
    expect(meetsPriorityPromise({ end: '2026-07-16T10:00:00-05:00' }, now, 48)).toBe(true);
    expect(meetsPriorityPromise({ end: '2026-07-16T10:01:00-05:00' }, now, 48)).toBe(false);
    expect(() => meetsPriorityPromise({ end: 'soon' }, now, 48)).toThrow(/window\.end/);
    expect(() => meetsPriorityPromise({ end: now }, now, 0)).toThrow(/promiseHours/);
  });
});

describe('planBooking and nextFreeWindows', () => {
  it('picks the earliest arrival, then the technician with the lighter day', () => {
    const two = [tech('ana'), tech('ben')];
    const booked: BookedVisit[] = [{ technicianId: 'ana', start: at('14:00'), end: at('15:30') }];
    const plan = planBooking(input({ technicians: two, booked }), at('08:00'));
    expect(plan).toEqual({
      ok: true,
      visit: {
        technicianId: 'ben',
        start: at('08:00'),
        end: at('09:30'),
        window: expect.objectContaining({ start: at('08:00'), end: at('10:00'), capacity: 2 }),
      },
    });
  });

  it('answers a window that just filled with the next free ones', () => {
    const booked: BookedVisit[] = [{ technicianId: 'ana', start: at('12:00'), end: at('13:30'), priority: true }];
    const plan = planBooking(input({ booked }), at('12:00'));
    expect(plan).toEqual({
      ok: false,
      reason: 'window_full',
      alternatives: [
        expect.objectContaining({ start: at('14:00') }),
        expect.objectContaining({ start: at('08:00', '2026-07-15') }),
        expect.objectContaining({ start: at('10:00', '2026-07-15') }),
      ],
    });
  });

  it('nextFreeWindows searches past the request’s date range', () => {
    const ws = nextFreeWindows(input(), { after: at('14:00', '2026-07-17'), count: 2 });
    // Friday 16:00 cannot fit a tune-up before 17:00; Saturday the technician is off; Monday 20 Jul is next.
    expect(ws.map((w) => w.start)).toEqual([at('08:00', '2026-07-20'), at('10:00', '2026-07-20')]);
    expect(() => nextFreeWindows(input(), { count: 0 })).toThrow(/count/);
  });

  it('rejects a window start without an offset', () => {
    expect(() => planBooking(input(), '2026-07-14T08:00:00')).toThrow(/windowStart/);
  });
});

describe('input errors name the field', () => {
  const cases: Array<[string, AvailabilityInput, RegExp]> = [
    ['time zone', input({ settings: { timeZone: 'Central Time' } }), /^settings\.timeZone:/],
    ['visit kind', input({ request: { visitKind: 'duct_cleaning' } }), /^request\.visitKind:/],
    ['now without offset', input({ request: { now: '2026-07-14T08:00:00' } }), /^request\.now:/],
    ['share over 90 %', input({ settings: { heldBackShare: 1.5 } }), /^settings\.heldBackShare:/],
    ['closing before opening', input({ settings: { businessHours: { mon: [{ open: '17:00', close: '08:00' }] } } }), /^settings\.businessHours\.mon\.0\.close:/],
    ['clock time', input({ technicians: [tech('ana', { weeklyHours: { tue: [{ open: '8am', close: '17:00' }] } })] }), /^technicians\.0\.weeklyHours\.tue\.0\.open:/],
    ['dates reversed', input({ request: { from: '2026-07-15', to: '2026-07-14' } }), /^request\.to:/],
    ['fractional buffer', input({ settings: { travelBufferMinutes: 12.5 } }), /^settings\.travelBufferMinutes:/],
    ['visit ends before start', input({ booked: [{ technicianId: 'ana', start: at('10:00'), end: at('09:00') }] }), /^booked\.0\.end:/],
  ];
  it.each(cases)('%s', (_name, bad, message) => {
    expect(() => availableWindows(bad)).toThrow(SchedulingInputError);
    expect(() => availableWindows(bad)).toThrow(message);
  });
});

describe('offered windows are really free (checked minute by minute)', () => {
  const DAY = Date.parse(at('00:00'));
  const MIN = 60_000;
  const shift = { start: Date.parse(at('08:00')), end: Date.parse(at('17:00')) };

  // Straightforward oracle: try every minute of the window against every booked visit ± buffer.
  function freeMinute(techId: string, booked: BookedVisit[], from: number, to: number, len: number, buffer: number): number | null {
    for (let t = from; t < to; t += MIN) {
      if (t < shift.start || t + len > shift.end) continue;
      const clash = booked.some((v) => v.technicianId === techId && t < Date.parse(v.end) + buffer && Date.parse(v.start) - buffer < t + len);
      if (!clash) return t;
    }
    return null;
  }

  const visit = fc
    .record({ techId: fc.constantFrom('ana', 'ben'), startQ: fc.integer({ min: 28, max: 68 }), lenQ: fc.integer({ min: 2, max: 8 }) })
    .map(({ techId, startQ, lenQ }) => ({
      technicianId: techId,
      start: new Date(DAY + startQ * 15 * MIN).toISOString(),
      end: new Date(DAY + (startQ + lenQ) * 15 * MIN).toISOString(),
    }));

  it('matches the oracle for random booked days', () => {
    fc.assert(
      fc.property(fc.array(visit, { maxLength: 6 }), fc.integer({ min: 0, max: 60 }), (booked, buffer) => {
        const i = input({ technicians: [tech('ana'), tech('ben')], booked, settings: { travelBufferMinutes: buffer }, request: { member: true } });
        const offered = new Map(availableWindows(i).map((w) => [w.start, w]));
        for (let h = 8; h < 17; h += 2) {
          const ws = Date.parse(at(`${String(h).padStart(2, '0')}:00`));
          const we = Math.min(ws + 120 * MIN, shift.end);
          const free = ['ana', 'ben'].filter((id) => freeMinute(id, booked, ws, we, 90 * MIN, buffer * MIN) !== null);
          const w = offered.get(at(`${String(h).padStart(2, '0')}:00`));
          expect(w?.technicianIds ?? []).toEqual(free);
          if (w) {
            const plan = planBooking(i, w.start);
            if (!plan.ok) throw new Error('offered window could not be planned');
            const earliest = Math.min(...free.map((id) => freeMinute(id, booked, ws, we, 90 * MIN, buffer * MIN)!));
            expect(Date.parse(plan.visit.start)).toBe(earliest);
            expect(freeMinute(plan.visit.technicianId, booked, earliest, earliest + MIN, 90 * MIN, buffer * MIN)).toBe(earliest);
          }
        }
      }),
      { numRuns: 150, seed: 20260714 },
    );
  });
});
