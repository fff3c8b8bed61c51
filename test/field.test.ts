import { hash } from '@node-rs/argon2';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { and, eq } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tuneUpSeasonOf } from '../shared/coverage';
import { evaluateReadings } from '../shared/hvac';
import { visitTimeLabels } from '../shared/visits';
import * as t from '../server/db/schema';
import { DEMO_STAFF_PASSWORD } from '../server/db/seed/scenario';
import { startSmtpCatcher, type SmtpCatcher } from '../server/fakes/mail';
import { createMailer, type Mailer } from '../server/integrations/mail';
import { anonymous, signInHomeowner, signInStaff, type Signed } from './support/auth';
import { testApp, type TestContext } from './support/app';

const ZONE = 'America/Chicago';
const tag = `f${Date.now().toString(36)}${Math.floor(Math.random() * 1e4)}`;

interface Fixture {
  techEmail: string;
  otherTechEmail: string;
  homeownerEmail: string;
  customerId: string;
  propertyId: string;
  condenserId: string;
  furnaceId: string;
  foreignEquipmentId: string;
  tuneUpId: string;
  callId: string;
  otherTechVisitId: string;
  pastVisitId: string;
  elevationFt: number;
}

async function technician(ctx: TestContext, email: string, name: string, passwordHash: string): Promise<string> {
  const db = ctx.database.db;
  const [u] = await db.insert(t.users).values({ email, name, role: 'technician', passwordHash }).returning({ id: t.users.id });
  const [tech] = await db
    .insert(t.technicians)
    .values({ userId: u!.id, skills: ['refrigerant', 'gas_furnace'], weeklyHours: { '1': { start: '08:00', end: '17:00' } } })
    .returning({ id: t.technicians.id });
  return tech!.id;
}

async function fixture(ctx: TestContext): Promise<Fixture> {
  const db = ctx.database.db;
  const passwordHash = await hash(DEMO_STAFF_PASSWORD);
  const techEmail = `${tag}.tech@field.test`;
  const otherTechEmail = `${tag}.other@field.test`;
  const techId = await technician(ctx, techEmail, 'Orrin Test-Tech', passwordHash);
  const otherTechId = await technician(ctx, otherTechEmail, 'Pella Test-Tech', passwordHash);

  const homeownerEmail = `${tag}.home@example.test`;
  const [customer] = await db
    .insert(t.customers)
    .values({ name: `${tag} household`, email: homeownerEmail })
    .returning({ id: t.customers.id });
  await db.insert(t.users).values({ email: homeownerEmail, name: 'Field Test Homeowner', role: 'homeowner', customerId: customer!.id });
  const elevationFt = 905;
  const [property] = await db
    .insert(t.properties)
    .values({
      customerId: customer!.id,
      street: '12 Test Furrow Lane',
      city: 'Larkspur Bend',
      state: 'MO',
      zip: '64790',
      elevationFt,
      accessNotes: 'Gate code 9911. Dog in the yard.',
    })
    .returning({ id: t.properties.id });
  const today = DateTime.now().setZone(ZONE).startOf('day');
  const [condenser] = await db
    .insert(t.equipment)
    .values({
      propertyId: property!.id,
      kind: 'condensing_unit',
      make: 'Vellmar',
      model: 'AC36-2',
      serial: `VE${tag}`,
      installedOn: today.minus({ years: 7, days: 10 }).toISODate()!,
      warrantyEndsOn: today.plus({ years: 3 }).toISODate()!,
      refrigerant: 'R-410A',
      meteringDevice: 'fixed',
      capacityBtuh: 36000,
      volts: 230,
      phase: 1,
      ratedAmps: 16.7,
    })
    .returning({ id: t.equipment.id });
  const [furnace] = await db
    .insert(t.equipment)
    .values({
      propertyId: property!.id,
      kind: 'gas_furnace',
      make: 'Vellmar',
      model: 'GF80',
      installedOn: today.minus({ years: 7 }).toISODate()!,
      warrantyEndsOn: today.minus({ days: 1 }).toISODate()!,
    })
    .returning({ id: t.equipment.id });

  // Another home's equipment, to prove readings cannot be filed against it.
  const [otherCustomer] = await db
    .insert(t.customers)
    .values({ name: `${tag} neighbours` })
    .returning({ id: t.customers.id });
  const [otherProperty] = await db
    .insert(t.properties)
    .values({ customerId: otherCustomer!.id, street: '14 Test Furrow Lane', city: 'Larkspur Bend', state: 'MO', zip: '64790' })
    .returning({ id: t.properties.id });
  const [foreign] = await db.insert(t.equipment).values({ propertyId: otherProperty!.id, kind: 'heat_pump' }).returning({ id: t.equipment.id });

  const [pv] = await db
    .select({ id: t.planVersions.id })
    .from(t.planVersions)
    .innerJoin(t.plans, eq(t.planVersions.planId, t.plans.id))
    .where(eq(t.plans.code, 'priority-comfort'));
  const startsOn = today.minus({ days: 100 });
  const [agreement] = await db
    .insert(t.agreements)
    .values({
      customerId: customer!.id,
      propertyId: property!.id,
      planVersionId: pv!.id,
      status: 'active',
      startsOn: startsOn.toISODate()!,
      endsOn: startsOn.plus({ years: 1 }).toISODate()!,
      priceCents: 25900,
    })
    .returning({ id: t.agreements.id });

  const at = (day: DateTime, hour: number, minutes: number) => {
    const s = day.set({ hour, minute: 0 });
    return { windowStart: s.toJSDate(), windowEnd: s.plus({ hours: 2 }).toJSDate(), startsAt: s.toJSDate(), endsAt: s.plus({ minutes }).toJSDate() };
  };
  const base = { customerId: customer!.id, propertyId: property!.id, agreementId: agreement!.id };
  // Listed out of time order on purpose.
  const [call] = await db
    .insert(t.visits)
    .values({ ...base, technicianId: techId, kind: 'service_call', reason: 'no_cooling', status: 'scheduled', notes: 'Warm upstairs.', ...at(today, 13, 120) })
    .returning({ id: t.visits.id });
  const [tuneUp] = await db
    .insert(t.visits)
    .values({ ...base, technicianId: techId, kind: 'tune_up', reason: 'tune_up', status: 'scheduled', ...at(today, 9, 90) })
    .returning({ id: t.visits.id });
  const [otherTech] = await db
    .insert(t.visits)
    .values({ ...base, technicianId: otherTechId, kind: 'service_call', reason: 'noise', status: 'scheduled', ...at(today, 10, 60) })
    .returning({ id: t.visits.id });
  // A completed tune-up 20 days ago in the same term, with findings the technician should see.
  const past = today.minus({ days: 20 });
  const [pastVisit] = await db
    .insert(t.visits)
    .values({
      ...base,
      technicianId: otherTechId,
      kind: 'tune_up',
      reason: 'tune_up',
      status: 'done',
      findings: 'Flame sensor cleaned.',
      recommendations: 'Coil cleaning recommended.',
      completedAt: past.set({ hour: 11 }).toJSDate(),
      ...at(past, 9, 90),
    })
    .returning({ id: t.visits.id });

  return {
    techEmail,
    otherTechEmail,
    homeownerEmail,
    customerId: customer!.id,
    propertyId: property!.id,
    condenserId: condenser!.id,
    furnaceId: furnace!.id,
    foreignEquipmentId: foreign!.id,
    tuneUpId: tuneUp!.id,
    callId: call!.id,
    otherTechVisitId: otherTech!.id,
    pastVisitId: pastVisit!.id,
    elevationFt,
  };
}

let ctx: TestContext;
let catcher: SmtpCatcher;
let mailer: Mailer;
let f: Fixture;
let tech: Signed;

beforeAll(async () => {
  catcher = await startSmtpCatcher({ port: 0 });
  mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${catcher.port}`, from: 'Bluestem Comfort <office@bluestem-comfort.test>' });
  ctx = testApp({ mailer, env: { STORAGE_DIR: mkdtempSync(join(tmpdir(), 'sw-field-')) } });
  f = await fixture(ctx);
  tech = await signInStaff(ctx, f.techEmail);
});

afterAll(async () => {
  mailer.close();
  await catcher.close();
  await ctx.close();
});

const put = (s: Signed, url: string, body: unknown) =>
  s.agent
    .put(url)
    .set('X-XSRF-TOKEN', s.csrf)
    .send(body as object);
const post = (s: Signed, url: string, body: unknown) =>
  s.agent
    .post(url)
    .set('X-XSRF-TOKEN', s.csrf)
    .send(body as object);

describe('access to the field API', () => {
  it('answers 401 without a session and 403 to a homeowner', async () => {
    const anon = await anonymous(ctx);
    await anon.agent.get('/api/field/visits/today').expect(401);
    const home = await signInHomeowner(ctx, f.homeownerEmail);
    await home.agent.get('/api/field/visits/today').expect(403);
    await put(home, `/api/field/visits/${f.tuneUpId}/readings`, { equipmentId: f.condenserId, readings: {} }).expect(403);
  });

  it("hides another technician's visit as not found, and a malformed id too", async () => {
    const res = await tech.agent.get(`/api/field/visits/${f.otherTechVisitId}`).expect(404);
    expect(res.body.error.code).toBe('not_found');
    await put(tech, `/api/field/visits/${f.otherTechVisitId}/readings`, { equipmentId: f.condenserId, readings: { returnDryBulbF: 75 } }).expect(404);
    await tech.agent.get('/api/field/visits/not-a-uuid').expect(404);
  });
});

describe("today's visits", () => {
  it("lists the technician's own visits in time order with address, window, reason and plan status", async () => {
    const res = await tech.agent.get('/api/field/visits/today').expect(200);
    expect(res.body.visits.map((v: { id: string }) => v.id)).toEqual([f.tuneUpId, f.callId]);
    const [first, second] = res.body.visits;
    expect(first.address).toBe('12 Test Furrow Lane, Larkspur Bend, MO 64790');
    expect(first.windowLabel).toBe('9–11 am');
    expect(second.windowLabel).toBe('1–3 pm');
    // One definition of a visit's time in every view: the arrival window, and the work booked within it.
    expect([first.arrivalLabel, first.workLabel]).toEqual(['Arrival 9–11 am', '1 h 30 min of work booked']);
    const week = await tech.agent.get('/api/schedule/week').expect(200);
    const same = week.body.visits.find((v: { id: string }) => v.id === f.tuneUpId);
    expect(visitTimeLabels(same, week.body.timeZone)).toEqual({ arrival: first.arrivalLabel, work: first.workLabel });
    expect(second.reasonLabel).toBe('No cooling');
    expect(first.planStatus).toEqual({ covered: true, label: 'Priority Comfort · Active' });
  });

  it("lets the owner open any technician's visit and see every assigned visit today", async () => {
    const owner = await signInStaff(ctx, 'rosalind.okafor@bluestem-comfort.test');
    const list = await owner.agent.get('/api/field/visits/today').expect(200);
    const ids = list.body.visits.map((v: { id: string }) => v.id);
    expect(ids).toEqual(expect.arrayContaining([f.tuneUpId, f.callId, f.otherTechVisitId]));
    const page = await owner.agent.get(`/api/field/visits/${f.otherTechVisitId}`).expect(200);
    expect(page.body.visit.technicianName).toBe('Pella Test-Tech');
    const office = await signInStaff(ctx, 'teo.marchetti@bluestem-comfort.test');
    await office.agent.get(`/api/field/visits/${f.callId}`).expect(403);
  });

  it("gives the seeded technician the demo day's two visits, earliest first", async () => {
    const marcus = await signInStaff(ctx, 'marcus.bellweather@bluestem-comfort.test');
    const res = await marcus.agent.get('/api/field/visits/today').expect(200);
    const starts = res.body.visits.map((v: { windowStart: string }) => v.windowStart);
    expect(starts.length).toBeGreaterThanOrEqual(2);
    expect([...starts].sort()).toEqual(starts);
    expect(res.body.visits.map((v: { reason: string }) => v.reason)).toEqual(expect.arrayContaining(['tune_up', 'no_cooling']));
  });
});

describe('visit page', () => {
  it('shows the property, equipment, access notes, past findings, coverage and cautions', async () => {
    const res = await tech.agent.get(`/api/field/visits/${f.callId}`).expect(200);
    const page = res.body;
    expect(page.property.accessNotes).toBe('Gate code 9911. Dog in the yard.');
    const condenser = page.equipment.find((e: { id: string }) => e.id === f.condenserId);
    expect(condenser).toMatchObject({ model: 'AC36-2', refrigerant: 'R-410A', ageYears: 7, underWarranty: true, nominalTons: 3 });
    expect(page.equipment.find((e: { id: string }) => e.id === f.furnaceId).underWarranty).toBe(false);
    expect(page.pastVisits[0]).toMatchObject({ id: f.pastVisitId, findings: 'Flame sensor cleaned.', recommendations: 'Coil cleaning recommended.' });
    expect(page.troubleshootingKind).toBe('no_cooling');
    expect(page.season).toBe('cooling');
    // The seeded company's $89.00 diagnostic fee, waived on this plan.
    expect(page.coverage).toMatchObject({
      covered: true,
      planName: 'Priority Comfort',
      repairDiscountBps: 1500,
      diagnosticFee: { applies: true, feeCents: 8900, waived: true, chargeCents: 0 },
    });
    const ids = page.cautions.map((c: { id: string }) => c.id);
    expect(ids).toEqual(expect.arrayContaining(['refrigerant_certification', 'electrical_power_and_capacitors', 'fuel_burning_equipment']));
    for (const c of page.cautions) expect(c.text).toMatch(/local|licensed/i);
  });

  it("counts the term's completed tune-up against its season", async () => {
    const res = await tech.agent.get(`/api/field/visits/${f.tuneUpId}`).expect(200);
    const { coverage } = res.body;
    const today = DateTime.now().setZone(ZONE);
    const season = tuneUpSeasonOf(today.toISODate()!);
    const pastSeason = tuneUpSeasonOf(today.minus({ days: 20 }).toISODate()!);
    expect(coverage.tuneUpSeason).toBe(season);
    const mine = coverage.allowances.find((a: { season: string }) => a.season === season);
    // The plan includes one tune-up per season; the one 20 days ago used it if the season matches.
    expect(mine).toMatchObject({ included: 1, used: pastSeason === season ? 1 : 0 });
    expect(coverage.tuneUpIncluded).toBe(pastSeason !== season);
    expect(coverage.diagnosticFee.applies).toBe(false);
    expect(res.body.checklist.map((s: { equipmentId: string }) => s.equipmentId)).toEqual([f.condenserId, f.furnaceId]);
  });
});

describe('readings', () => {
  const readings = {
    mode: 'cooling',
    returnDryBulbF: 75,
    supplyDryBulbF: 55,
    indoorWetBulbF: 61,
    capacitors: { compressor: { ratedUf: 7.5, measuredUf: 6.9 } },
    controlVoltageVac: 24.6,
  };

  it('re-evaluates on the server and stores what it computed, with the altitude from the property', async () => {
    const res = await put(tech, `/api/field/visits/${f.callId}/readings`, { equipmentId: f.condenserId, readings }).expect(200);
    const split = res.body.checks.find((c: { check: string }) => c.check === 'temperature_split');
    // 75 °F return, 55 °F supply at 61 °F wet bulb: a 20 °F split against 19.9 ± 3 °F (Title 24 RA3.2 table, from memory).
    expect(split).toMatchObject({ value: 20, status: 'ok' });
    const cap = res.body.checks.find((c: { check: string }) => c.check === 'capacitor_compressor');
    // 6.9 µF on a 7.5 µF part is outside ±6 % (7.05–7.95 µF) (common practice).
    expect(cap.status).toBe('alert');
    expect(res.body.worstStatus).toBe('alert');
    expect(res.body.readings.altitudeFt).toBe(f.elevationFt);

    const [row] = await ctx.database.db.select().from(t.visitReadings).where(eq(t.visitReadings.visitId, f.callId));
    expect(row!.checks).toEqual(evaluateReadings({ ...readings, mode: 'cooling', altitudeFt: f.elevationFt }));
    expect(row!.worstStatus).toBe('alert');
  });

  it('replaces the first copy when the same save is retried', async () => {
    await put(tech, `/api/field/visits/${f.callId}/readings`, { equipmentId: f.condenserId, readings }).expect(200);
    await put(tech, `/api/field/visits/${f.callId}/readings`, { equipmentId: f.condenserId, readings }).expect(200);
    const rows = await ctx.database.db
      .select()
      .from(t.visitReadings)
      .where(and(eq(t.visitReadings.visitId, f.callId), eq(t.visitReadings.equipmentId, f.condenserId)));
    expect(rows).toHaveLength(1);
    const page = await tech.agent.get(`/api/field/visits/${f.callId}`).expect(200);
    expect(page.body.readings).toHaveLength(1);
    expect(page.body.readings[0].readings.returnDryBulbF).toBe(75);
  });

  it('refuses impossible readings with the field named', async () => {
    let res = await put(tech, `/api/field/visits/${f.callId}/readings`, {
      equipmentId: f.condenserId,
      readings: { mode: 'cooling', returnDryBulbF: 70, supplyDryBulbF: 80 },
    }).expect(422);
    expect(Object.keys(res.body.error.fields)).toContain('readings.supplyDryBulbF');
    res = await put(tech, `/api/field/visits/${f.callId}/readings`, { equipmentId: f.condenserId, readings: { returnDryBulbF: 75, returnRelativeHumidityPct: 120 } }).expect(422);
    expect(res.body.error.fields['readings.returnRelativeHumidityPct']).toMatch(/100/);
    res = await put(tech, `/api/field/visits/${f.callId}/readings`, {
      equipmentId: f.condenserId,
      readings: { suctionPressurePsig: -20, suctionLineTempF: 50, refrigerant: 'R-410A' },
    }).expect(422);
    expect(res.body.error.fields['readings.suctionPressurePsig']).toMatch(/vacuum/);
    res = await put(tech, `/api/field/visits/${f.callId}/readings`, { equipmentId: f.foreignEquipmentId, readings: { returnDryBulbF: 75 } }).expect(422);
    expect(res.body.error.fields).toHaveProperty('equipmentId');
    res = await put(tech, `/api/field/visits/${f.callId}/readings`, { equipmentId: f.condenserId, readings: { returnDryBulbF: 'warm' } }).expect(422);
    expect(res.body.error.fields).toHaveProperty('readings.returnDryBulbF');
  });
});

describe('checklist and troubleshooting', () => {
  it("saves checklist results against the season's items and refuses unknown ones", async () => {
    const page = (await tech.agent.get(`/api/field/visits/${f.tuneUpId}?season=cooling`).expect(200)).body;
    const section = page.checklist.find((s: { equipmentId: string }) => s.equipmentId === f.condenserId);
    const [a, b] = section.items;
    const res = await put(tech, `/api/field/visits/${f.tuneUpId}/checklist`, {
      season: 'cooling',
      items: [
        { equipmentId: f.condenserId, itemId: a.id, result: 'done' },
        { equipmentId: f.condenserId, itemId: b.id, result: 'needs_attention', note: 'Fins flattened on the north face' },
      ],
    }).expect(200);
    const saved = res.body.checklist.find((s: { equipmentId: string }) => s.equipmentId === f.condenserId).items;
    expect(saved[0]).toMatchObject({ id: a.id, result: 'done' });
    expect(saved[1]).toMatchObject({ id: b.id, result: 'needs_attention', note: 'Fins flattened on the north face' });
    expect(saved[2].result).toBeNull();

    const bad = await put(tech, `/api/field/visits/${f.tuneUpId}/checklist`, {
      season: 'cooling',
      items: [{ equipmentId: f.condenserId, itemId: 'gf.burners', result: 'done' }],
    }).expect(422);
    expect(bad.body.error.fields).toHaveProperty(['items.0.itemId']);
    const wrong = await put(tech, `/api/field/visits/${f.tuneUpId}/checklist`, {
      season: 'cooling',
      items: [{ equipmentId: f.condenserId, itemId: a.id, result: 'maybe' }],
    }).expect(422);
    expect(wrong.body.error.fields).toHaveProperty(['items.0.result']);
  });

  it('records the no-cooling troubleshooting steps, cause and fix', async () => {
    const record = {
      thermostatCalling: true,
      controlVoltageAtRC: true,
      callVoltageAtYCOutdoor: false,
      condensateSwitchTripped: true,
      breakerTripped: false,
      causeFound: 'Condensate overflow switch tripped by a clogged drain line.',
      fixMade: 'Flushed the drain line and reset the switch.',
    };
    await put(tech, `/api/field/visits/${f.callId}/troubleshooting`, record).expect(200);
    const page = (await tech.agent.get(`/api/field/visits/${f.callId}`).expect(200)).body;
    expect(page.troubleshooting).toMatchObject({ ...record, fuseBlown: null, disconnectOff: null });
    const bad = await put(tech, `/api/field/visits/${f.callId}/troubleshooting`, { thermostatCalling: 'yes' }).expect(422);
    expect(bad.body.error.fields).toHaveProperty('thermostatCalling');
  });
});

describe('photos', () => {
  it('shows photos uploaded against the visit on the visit page', async () => {
    const png = await sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 120, g: 140, b: 90 } } })
      .png()
      .toBuffer();
    await tech.agent
      .post('/api/files')
      .set('X-XSRF-TOKEN', tech.csrf)
      .field('visitId', f.callId)
      .field('category', 'problem')
      .field('caption', 'Clogged drain pan')
      .attach('files', png, { filename: 'drain-pan.png', contentType: 'image/png' })
      .expect(201);
    const page = (await tech.agent.get(`/api/field/visits/${f.callId}`).expect(200)).body;
    expect(page.photos).toHaveLength(1);
    expect(page.photos[0]).toMatchObject({ caption: 'Clogged drain pan', visitId: f.callId, category: 'problem' });
    await tech.agent.get(page.photos[0].thumbUrl).expect(200).expect('Content-Type', 'image/webp');
  });
});

describe('completing the visit', () => {
  it('needs findings', async () => {
    const res = await post(tech, `/api/field/visits/${f.callId}/complete`, { findings: '  ' }).expect(422);
    expect(res.body.error.fields).toHaveProperty('findings');
  });

  it('refuses, with 409, to complete a visit the technician never started', async () => {
    const res = await post(tech, `/api/field/visits/${f.tuneUpId}/complete`, { findings: 'Nothing was looked at.' }).expect(409);
    expect(res.body.error.code).toBe('bad_transition');
    expect(res.body.error.message).toBe('A visit that is scheduled cannot become done.');
    const [row] = await ctx.database.db.select({ status: t.visits.status, completedAt: t.visits.completedAt }).from(t.visits).where(eq(t.visits.id, f.tuneUpId));
    expect(row).toEqual({ status: 'scheduled', completedAt: null });
    const events = await ctx.database.db.select().from(t.visitEvents).where(eq(t.visitEvents.visitId, f.tuneUpId));
    expect(events.map((e) => e.toStatus)).not.toContain('done');
  });

  it('marks it done, e-mails the homeowner a plain-words summary once, and locks the record', async () => {
    catcher.store.clear();
    // The technician starts the visit first: on the way, then on site.
    await post(tech, `/api/dispatch/visits/${f.callId}/status`, { status: 'on_the_way' }).expect(200);
    await post(tech, `/api/dispatch/visits/${f.callId}/status`, { status: 'on_site' }).expect(200);
    catcher.store.clear();
    const body = { findings: 'Clogged condensate drain tripped the overflow switch. Flushed and reset.', recommendations: 'Coil cleaning recommended.' };
    const res = await post(tech, `/api/field/visits/${f.callId}/complete`, body).expect(200);
    expect(res.body).toMatchObject({ id: f.callId, status: 'done', summaryEmailed: true });

    const mail = catcher.store.latest({ to: f.homeownerEmail });
    expect(mail).toBeDefined();
    expect(mail!.subject).toMatch(/no cooling visit summary/i);
    expect(mail!.text).toContain('Coil cleaning recommended.');
    expect(mail!.text).toContain('Cooling check: the air leaving your system is 20 °F cooler than the air going in, in the normal range.');
    expect(mail!.text).toMatch(/capacitor that helps the compressor start and run is outside the normal range/);
    expect(mail!.links.some((l) => l.endsWith(`/portal/visits/${f.callId}`))).toBe(true);
    // Plain words: no engine jargon in the homeowner's copy.
    expect(mail!.text).not.toMatch(/superheat|µF|RLA|FLA/);

    const [events] = [await ctx.database.db.select().from(t.visitEvents).where(eq(t.visitEvents.visitId, f.callId))];
    expect(events.map((e) => e.toStatus)).toContain('done');

    const again = await post(tech, `/api/field/visits/${f.callId}/complete`, body).expect(200);
    expect(again.body.summaryEmailed).toBe(false);
    expect(catcher.store.list({ to: f.homeownerEmail })).toHaveLength(1);

    const locked = await put(tech, `/api/field/visits/${f.callId}/readings`, { equipmentId: f.condenserId, readings }).expect(409);
    expect(locked.body.error.code).toBe('conflict');
  });

  it("closes a tune-up only with a reason for its open checklist items, and a repair only with the homeowner's signature, and keeps both", async () => {
    await post(tech, `/api/dispatch/visits/${f.tuneUpId}/status`, { status: 'on_the_way' }).expect(200);
    await post(tech, `/api/dispatch/visits/${f.tuneUpId}/status`, { status: 'on_site' }).expect(200);
    const findings = { findings: 'System cleaned and checked.', recommendations: '' };

    const unexplained = await post(tech, `/api/field/visits/${f.tuneUpId}/complete`, findings).expect(422);
    expect(unexplained.body.error.fields.skippedReason).toMatch(/^Say why these \d+ checklist items were skipped: /);

    const unsigned = await post(tech, `/api/field/visits/${f.tuneUpId}/complete`, { ...findings, skippedReason: 'Homeowner asked us to skip the attic.', repairDone: true }).expect(
      422,
    );
    expect(unsigned.body.error.fields).toEqual({ signature: expect.stringMatching(/homeowner signs/) });

    const badImage = await post(tech, `/api/field/visits/${f.tuneUpId}/complete`, {
      ...findings,
      repairDone: true,
      signature: { image: 'data:text/html;base64,PHA+', signedBy: 'Dana' },
    }).expect(422);
    expect(badImage.body.error.fields['signature.image']).toMatch(/PNG/);

    // 1×1 transparent PNG (PNG specification: signature, IHDR, IDAT, IEND).
    const image = 'data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAQAAAC1HAwCAAAAC0lEQVR42mNkYAAAAAYAAjCB0C8AAAAASUVORK5CYII=';
    const done = await post(tech, `/api/field/visits/${f.tuneUpId}/complete`, {
      ...findings,
      skippedReason: 'Homeowner asked us to skip the attic.',
      repairDone: true,
      signature: { image, signedBy: 'Dana Whitfield' },
    }).expect(200);
    expect(done.body.status).toBe('done');
    const [row] = await ctx.database.db
      .select({
        skippedReason: t.visits.skippedReason,
        repairDone: t.visits.repairDone,
        signatureImage: t.visits.signatureImage,
        signedBy: t.visits.signedBy,
        signedAt: t.visits.signedAt,
      })
      .from(t.visits)
      .where(eq(t.visits.id, f.tuneUpId));
    expect(row).toMatchObject({ skippedReason: 'Homeowner asked us to skip the attic.', repairDone: true, signatureImage: image, signedBy: 'Dana Whitfield' });
    expect(row!.signedAt).toBeInstanceOf(Date);
    // Later tests read this tune-up as not yet done: put it back as it was.
    await ctx.database.db
      .update(t.visits)
      .set({ status: 'scheduled', completedAt: null, skippedReason: '', repairDone: false, signatureImage: null, signedBy: null, signedAt: null })
      .where(eq(t.visits.id, f.tuneUpId));
  });

  const readings = { returnDryBulbF: 75, supplyDryBulbF: 55, indoorWetBulbF: 61 };
});

describe('homeowner readings history and visit summary', () => {
  it("shows the household its completed visit in plain words and the chart's series with bands", async () => {
    const home = await signInHomeowner(ctx, f.homeownerEmail);
    const summary = (await home.agent.get(`/api/portal/visit-summaries/${f.callId}`).expect(200)).body;
    expect(summary.findings).toMatch(/Clogged condensate drain/);
    expect(summary.readings[0].lines.map((l: { status: string }) => l.status)).toContain('alert');
    expect(summary.cautions.map((c: { id: string }) => c.id)).toContain('co_alarms');
    expect(summary.photos.map((p: { caption: string }) => p.caption)).toEqual(['Clogged drain pan']);

    const history = (await home.agent.get(`/api/portal/readings/properties/${f.propertyId}`).expect(200)).body;
    const system = history.systems.find((s: { equipmentId: string }) => s.equipmentId === f.condenserId);
    const split = system.series.find((s: { check: string }) => s.check === 'temperature_split');
    expect(split.points).toHaveLength(1);
    // Target split 19.9 ± 3 °F at 75 °F DB / 61 °F WB (Title 24 RA3.2 table, from memory).
    expect(split.points[0]).toMatchObject({ value: 20, status: 'ok', expected: { min: 16.9, max: 22.9, target: 19.9 } });

    // A visit not yet done has no summary for the homeowner.
    await home.agent.get(`/api/portal/visit-summaries/${f.tuneUpId}`).expect(404);
  });

  it("keeps other households out of this home's readings and visits", async () => {
    const other = await signInHomeowner(ctx, 'sam.oduya@example.test');
    await other.agent.get(`/api/portal/visit-summaries/${f.callId}`).expect(404);
    await other.agent.get(`/api/portal/readings/properties/${f.propertyId}`).expect(404);
    const anon = await anonymous(ctx);
    await anon.agent.get(`/api/portal/readings/properties/${f.propertyId}`).expect(401);
    const otherTech = await signInStaff(ctx, 'priya.dunmore@bluestem-comfort.test');
    await otherTech.agent.get(`/api/portal/readings/properties/${f.propertyId}`).expect(404);
  });
});
