import { hash } from '@node-rs/argon2';
import { DateTime } from 'luxon';
import type { EquipmentKind, RefrigerantName } from '../../../shared/equipment';
import type { VisitReason } from '../../../shared/visits';
import type { Db, Tx } from '../client';
import * as t from '../schema';
import { seededRandom, type Random } from './random';
import { AREAS, COMPANY, DEMO_HOMEOWNERS, DEMO_STAFF_PASSWORD, FIRST_NAMES, LAST_NAMES, MAKES, STAFF, STREETS } from './scenario';

const SEED = 20260401;
const HOUSEHOLDS = 40;
const SEED_LOCK = 7_311_205;

export interface SeedResult {
  seeded: boolean;
  households: number;
}

/** The household whose outdoor unit is a variable-speed heat pump, with a tune-up today. */
const VARIABLE_SPEED_HOUSEHOLD = 2;

/**
 * Makes the home's outdoor unit an inverter heat pump (paired with its furnace, dual fuel), with
 * the maximum compressor frequency a nameplate gives. Invented demo values; no random draws, so
 * the rest of the demo stays as it was.
 */
function variableSpeedOutdoorUnit(rows: (typeof t.equipment.$inferInsert)[]): void {
  const outdoor = rows.find((r) => r.kind === 'condensing_unit' || r.kind === 'heat_pump');
  if (!outdoor) return;
  Object.assign(outdoor, { kind: 'heat_pump', model: 'VS36-1', meteringDevice: 'eev', compressorType: 'variable_speed', maxCompressorHz: 110, maxExternalStaticInWc: 0.8 });
}

/** Seeds the demo scenario once. A second call finds the company row and does nothing. */
export async function seedDemo(db: Db, today: DateTime = DateTime.now().setZone(COMPANY.timeZone)): Promise<SeedResult> {
  return db.transaction(async (tx) => {
    await tx.execute(`select pg_advisory_xact_lock(${SEED_LOCK})`);
    const existing = await tx.select({ id: t.company.id }).from(t.company).limit(1);
    if (existing.length) return { seeded: false, households: 0 };
    await seedInto(tx, seededRandom(SEED), today.startOf('day'));
    return { seeded: true, households: HOUSEHOLDS };
  });
}

async function seedInto(tx: Tx, rnd: Random, today: DateTime) {
  const weekdays = { open: '07:30', close: '18:00' };
  await tx.insert(t.company).values({
    ...COMPANY,
    businessHours: { '1': weekdays, '2': weekdays, '3': weekdays, '4': weekdays, '5': weekdays, '6': { open: '08:00', close: '13:00' }, '7': null },
  });

  const staffHash = await hash(DEMO_STAFF_PASSWORD);
  const technicianIds: string[] = [];
  for (const s of STAFF) {
    const [user] = await tx.insert(t.users).values({ email: s.email, name: s.name, role: s.role, passwordHash: staffHash }).returning({ id: t.users.id });
    if (s.role === 'technician') {
      const saturday = s.name.startsWith('Eli');
      const day = { start: '08:00', end: '17:00' };
      const [tech] = await tx
        .insert(t.technicians)
        .values({
          userId: user!.id,
          skills: [...s.skills],
          truck: s.truck,
          weeklyHours: saturday ? { '2': day, '3': day, '4': day, '5': day, '6': { start: '08:00', end: '13:00' } } : { '1': day, '2': day, '3': day, '4': day, '5': day },
        })
        .returning({ id: t.technicians.id });
      technicianIds.push(tech!.id);
    }
  }

  const planRows = [
    {
      code: 'two-season',
      name: 'Two-Season Care',
      description: 'A cooling tune-up in spring and a heating tune-up in fall.',
      price: 17900,
      extra: 8900,
      discount: 1000,
      waived: true,
      priority: 72,
      extras: [] as string[],
    },
    {
      code: 'priority-comfort',
      name: 'Priority Comfort',
      description: 'Both tune-ups, front-of-the-line service and a bigger repair discount.',
      price: 25900,
      extra: 12900,
      discount: 1500,
      waived: true,
      priority: 24,
      extras: ['Standard 1-inch filters at each tune-up'],
    },
    {
      code: 'whole-home',
      name: 'Whole Home Plus',
      description: 'Everything in Priority Comfort, plus coil cleaning, condensate line care and humidifier service.',
      price: 36900,
      extra: 16900,
      discount: 2000,
      waived: true,
      priority: 12,
      extras: ['Filters at each tune-up', 'Outdoor coil cleaning once a year', 'Condensate line flush', 'Humidifier pad'],
    },
  ];
  const planVersionIds: { id: string; price: number; extra: number }[] = [];
  for (const [i, p] of planRows.entries()) {
    const [plan] = await tx.insert(t.plans).values({ code: p.code, name: p.name, description: p.description, sortOrder: i }).returning({ id: t.plans.id });
    const [version] = await tx
      .insert(t.planVersions)
      .values({
        planId: plan!.id,
        version: 1,
        yearlyPriceCents: p.price,
        additionalSystemCents: p.extra,
        coolingVisits: 1,
        heatingVisits: 1,
        repairDiscountBps: p.discount,
        diagnosticFeeWaived: p.waived,
        priorityWindowHours: p.priority,
        extras: p.extras,
      })
      .returning({ id: t.planVersions.id });
    planVersionIds.push({ id: version!.id, price: p.price, extra: p.extra });
  }

  const households: { customerId: string; propertyId: string; agreementId: string | null; hasGas: boolean; geo: boolean }[] = [];
  for (let h = 0; h < HOUSEHOLDS; h++) {
    const demo = DEMO_HOMEOWNERS[h];
    const first = rnd.pick(FIRST_NAMES);
    const last = LAST_NAMES[h % LAST_NAMES.length]!;
    const name = demo ? demo.household : `${last} household`;
    const email = demo ? demo.email : `${first.toLowerCase()}.${last.toLowerCase()}${h}@example.test`;
    const [customer] = await tx
      .insert(t.customers)
      .values({ name, email, phone: `+1816555${String(1000 + h * 37).padStart(4, '0')}` })
      .returning({ id: t.customers.id });
    const customerId = customer!.id;
    if (demo) await tx.insert(t.users).values({ email: demo.email, name: demo.name, role: 'homeowner', customerId });

    const [property] = await tx
      .insert(t.properties)
      .values({
        customerId,
        label: 'Home',
        street: `${100 + ((h * 53) % 2800)} ${STREETS[h % STREETS.length]}`,
        city: 'Larkspur Bend',
        state: 'MO',
        zip: h % 3 === 0 ? '64791' : '64790',
        area: AREAS[h % AREAS.length]!,
        elevationFt: 880 + (h % 7) * 15,
        accessNotes: h % 5 === 0 ? 'Side gate code 4417. Friendly dog in the back yard.' : h % 7 === 0 ? 'Unit is in the attic; ladder in the garage.' : '',
      })
      .returning({ id: t.properties.id });
    const propertyId = property!.id;

    const geo = h === 17;
    const heatPump = !geo && rnd.chance(0.35);
    const refrigerant: RefrigerantName = rnd.chance(0.3) ? 'R-454B' : 'R-410A';
    const drawnAge = rnd.int(1, 20);
    // The Oduya system (today's no-cooling call) is past its ten-year parts warranty, so the
    // replacement motor is charged, with the plan's repair discount.
    const age = h === 1 ? Math.max(drawnAge, 12) : drawnAge;
    const installed = today.minus({ years: age, days: rnd.int(0, 300) });
    const installedOn = installed.toISODate()!;
    const tons = rnd.pick([2, 2.5, 3, 3.5, 4, 5]);
    const make = rnd.pick(MAKES);
    const serial = () => `${make.slice(0, 2).toUpperCase()}${installed.toFormat('yyMM')}${rnd.int(10000, 99999)}`;
    const equipmentRows: (typeof t.equipment.$inferInsert)[] = [];
    const warranty = installed.plus({ years: 10 }).toISODate()!;
    const base = { propertyId, make, installedOn, warrantyEndsOn: warranty };
    if (geo) {
      equipmentRows.push({
        ...base,
        kind: 'geothermal_heat_pump',
        model: 'GW-036',
        serial: serial(),
        refrigerant: 'R-410A',
        meteringDevice: 'txv',
        capacityBtuh: 36000,
        volts: 230,
        phase: 1,
        ratedAmps: 17.9,
        filterSize: '20x25x4',
        filterType: 'Pleated media',
        merv: 11,
        location: 'Basement',
      });
    } else {
      const outdoorKind: EquipmentKind = heatPump ? 'heat_pump' : 'condensing_unit';
      equipmentRows.push({
        ...base,
        kind: outdoorKind,
        model: `${heatPump ? 'HP' : 'AC'}${Math.round(tons * 12)}-${rnd.int(1, 9)}`,
        serial: serial(),
        // R-454B equipment only exists from the last couple of years.
        refrigerant: age <= 2 ? refrigerant : 'R-410A',
        meteringDevice: rnd.chance(0.6) ? 'txv' : 'fixed',
        capacityBtuh: Math.round(tons * 12000),
        volts: 230,
        phase: 1,
        ratedAmps: Math.round(tons * 5.2 * 10) / 10,
        location: rnd.pick(['Side yard', 'Back yard', 'Roof']),
      });
      if (heatPump) {
        equipmentRows.push({
          ...base,
          kind: 'air_handler',
          model: `AH${Math.round(tons * 12)}`,
          serial: serial(),
          volts: 230,
          phase: 1,
          ratedAmps: 6.8,
          filterSize: '16x25x1',
          filterType: 'Pleated',
          merv: 8,
          location: 'Hall closet',
        });
      } else {
        equipmentRows.push({
          ...base,
          kind: 'gas_furnace',
          model: `GF${rnd.pick([60, 80, 100])}`,
          serial: serial(),
          volts: 115,
          phase: 1,
          ratedAmps: 7.4,
          filterSize: rnd.pick(['16x25x1', '20x25x1', '16x25x4']),
          filterType: 'Pleated',
          merv: rnd.pick([8, 11, 13]),
          location: rnd.pick(['Basement', 'Attic', 'Garage']),
        });
      }
    }
    equipmentRows.push({
      propertyId,
      kind: 'thermostat',
      make: rnd.pick(MAKES),
      model: 'T-7',
      installedOn: today.minus({ years: rnd.int(1, 6) }).toISODate()!,
      location: 'Hallway',
    });
    if (h % 4 === 1) equipmentRows.push({ propertyId, kind: 'condensate_pump', make: rnd.pick(MAKES), model: 'CP-1', installedOn, location: 'Beside the furnace' });
    if (h === VARIABLE_SPEED_HOUSEHOLD) variableSpeedOutdoorUnit(equipmentRows);
    await tx.insert(t.equipment).values(equipmentRows);

    // About two in three households hold an agreement; a few end soon so renewals have work.
    let agreementId: string | null = null;
    const demoEndsSoon = h === 0;
    if (demo || rnd.chance(0.6)) {
      const tier = demoEndsSoon ? planVersionIds[1]! : rnd.pick(planVersionIds);
      const endsIn = demoEndsSoon ? 20 : h === 1 ? 200 : rnd.int(-20, 350);
      const endsOn = today.plus({ days: endsIn });
      const startsOn = endsOn.minus({ years: 1 });
      const status = endsIn < 0 ? 'past_due' : endsIn <= 60 ? 'renewal_due' : 'active';
      const [agreement] = await tx
        .insert(t.agreements)
        .values({
          customerId,
          propertyId,
          planVersionId: tier.id,
          status,
          startsOn: startsOn.toISODate()!,
          endsOn: endsOn.toISODate()!,
          priceCents: tier.price,
          systemsCount: 1,
          autoRenew: rnd.chance(0.4) && !demoEndsSoon,
        })
        .returning({ id: t.agreements.id });
      agreementId = agreement!.id;
    }
    households.push({ customerId, propertyId, agreementId, hasGas: !heatPump && !geo, geo });
  }

  await seedVisits(tx, rnd, today, households, technicianIds);
  const trucks = await tx.select({ id: t.technicians.id, truck: t.technicians.truck }).from(t.technicians);
  await (
    await import('./pricebook')
  ).seedPriceBook(
    tx,
    technicianIds.map((id) => ({ id, truck: trucks.find((x) => x.id === id)?.truck ?? '' })),
  );
  await (await import('./field')).seedFieldReadings(tx, COMPANY.timeZone);
}

/** A year of past visits plus a few upcoming ones, one technician slot at a time so none overlap. */
async function seedVisits(
  tx: Tx,
  rnd: Random,
  today: DateTime,
  households: { customerId: string; propertyId: string; agreementId: string | null; hasGas: boolean; geo: boolean }[],
  technicianIds: string[],
) {
  const rows: (typeof t.visits.$inferInsert)[] = [];
  const slotHours = [8, 10, 13, 15];
  const used = new Set<string>();
  const book = (day: DateTime, tech: number) => {
    for (const hour of slotHours) {
      const key = `${day.toISODate()}-${tech}-${hour}`;
      if (!used.has(key)) {
        used.add(key);
        return day.set({ hour, minute: 0 });
      }
    }
    return null;
  };
  const findings: Record<VisitReason, [string, string]> = {
    tune_up: ['Cleaned condensate drain, tightened electrical connections, checked charge: readings in range.', 'Replace filter every 90 days.'],
    no_cooling: ['Failed run capacitor (measured 31 µF on a 45 µF part). Replaced capacitor; unit cooling normally.', 'Coil cleaning recommended before next summer.'],
    no_heat: ['Dirty flame sensor caused lockout. Cleaned sensor and verified ignition sequence.', 'Consider replacing the 12-year-old igniter at next tune-up.'],
    noise: ['Loose blower wheel set screw. Tightened and balanced.', ''],
    water_leak: ['Clogged condensate line tripped the float switch. Flushed line and treated pan.', 'Add a condensate line cleanout.'],
    thermostat: ['Thermostat batteries low and a loose C wire. Repaired wiring.', ''],
    other: ['Inspected system at homeowner request; no faults found.', ''],
  };
  for (const [i, h] of households.entries()) {
    const events: { day: DateTime; reason: VisitReason; kind: 'tune_up' | 'service_call' }[] = [];
    if (h.agreementId) {
      events.push({ day: today.minus({ days: 200 + (i % 30) }), reason: 'tune_up', kind: 'tune_up' });
      events.push({ day: today.minus({ days: 40 + (i % 25) }), reason: 'tune_up', kind: 'tune_up' });
    }
    if (rnd.chance(0.45)) {
      events.push({ day: today.minus({ days: rnd.int(5, 360) }), reason: rnd.pick(['no_cooling', 'no_heat', 'noise', 'water_leak', 'thermostat'] as const), kind: 'service_call' });
    }
    for (const e of events) {
      let day = e.day;
      if (day.weekday === 7) day = day.minus({ days: 1 });
      const techIndex = h.geo ? 0 : rnd.int(0, technicianIds.length - 1);
      const start = book(day, techIndex) ?? book(day.minus({ days: 1 }), techIndex);
      if (!start) continue;
      const [what, next] = findings[e.reason];
      const end = start.plus({ minutes: e.kind === 'tune_up' ? 90 : 120 });
      rows.push({
        customerId: h.customerId,
        propertyId: h.propertyId,
        agreementId: h.agreementId,
        technicianId: technicianIds[techIndex]!,
        kind: e.kind,
        reason: e.reason,
        status: 'done',
        windowStart: start.toJSDate(),
        windowEnd: start.plus({ hours: 2 }).toJSDate(),
        startsAt: start.toJSDate(),
        endsAt: end.toJSDate(),
        findings: what,
        recommendations: next,
        completedAt: end.toJSDate(),
        createdAt: start.minus({ days: 3 }).toJSDate(),
      });
    }
  }
  // Upcoming work for the next days: some assigned, some waiting in the queue.
  for (let d = 1; d <= 6; d++) {
    const day = today.plus({ days: d });
    if (day.weekday === 7) continue;
    for (let k = 0; k < 3; k++) {
      const h = households[(d * 7 + k * 11) % households.length]!;
      const techIndex = (d + k) % technicianIds.length;
      const start = book(day, techIndex);
      if (!start) continue;
      const assigned = k < 2;
      rows.push({
        customerId: h.customerId,
        propertyId: h.propertyId,
        agreementId: h.agreementId,
        technicianId: assigned ? technicianIds[techIndex]! : null,
        kind: k === 0 ? 'tune_up' : 'service_call',
        reason: k === 0 ? 'tune_up' : rnd.pick(['no_heat', 'noise', 'thermostat'] as const),
        status: assigned ? 'scheduled' : 'requested',
        windowStart: start.toJSDate(),
        windowEnd: start.plus({ hours: 2 }).toJSDate(),
        startsAt: start.toJSDate(),
        endsAt: start.plus({ minutes: k === 0 ? 90 : 120 }).toJSDate(),
        notes: k === 2 ? 'Furnace makes a rattling sound when it starts.' : '',
      });
    }
  }
  // Today's visits for the first technician, so the field screen has work.
  for (const [k, hour] of [9, 13].entries()) {
    const h = households[k]!;
    const start = today.set({ hour, minute: 0 });
    rows.push({
      customerId: h.customerId,
      propertyId: h.propertyId,
      agreementId: h.agreementId,
      technicianId: technicianIds[0]!,
      kind: k === 0 ? 'tune_up' : 'service_call',
      reason: k === 0 ? 'tune_up' : 'no_cooling',
      status: 'scheduled',
      windowStart: start.toJSDate(),
      windowEnd: start.plus({ hours: 2 }).toJSDate(),
      startsAt: start.toJSDate(),
      endsAt: start.plus({ minutes: k === 0 ? 90 : 120 }).toJSDate(),
      notes: k === 1 ? 'House is warm; outdoor fan runs but the air inside is not cold.' : '',
    });
  }
  // And a tune-up on the variable-speed heat pump, after the other two.
  const vs = households[VARIABLE_SPEED_HOUSEHOLD]!;
  const vsStart = today.set({ hour: 15, minute: 0 });
  rows.push({
    customerId: vs.customerId,
    propertyId: vs.propertyId,
    agreementId: vs.agreementId,
    technicianId: technicianIds[0]!,
    kind: 'tune_up',
    reason: 'tune_up',
    status: 'scheduled',
    windowStart: vsStart.toJSDate(),
    windowEnd: vsStart.plus({ hours: 2 }).toJSDate(),
    startsAt: vsStart.toJSDate(),
    endsAt: vsStart.plus({ minutes: 90 }).toJSDate(),
    notes: 'Variable-speed heat pump: use its charge test mode for the refrigerant readings.',
  });
  for (let i = 0; i < rows.length; i += 200) await tx.insert(t.visits).values(rows.slice(i, i + 200));
}
