import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ICAL from 'ical.js';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { randomUUID } from 'node:crypto';
import { testApp, type TestContext } from './support/app';
import { signInHomeowner, signInStaff, type Signed } from './support/auth';
import { startSmtpCatcher, type SmtpCatcher } from '../server/fakes/mail';
import { createMailer } from '../server/integrations/mail';
import * as t from '../server/db/schema';
import { sendDayBeforeReminders } from '../server/booking/day-before-notices';
import sharp from 'sharp';
import { formatPhone } from '../shared/phone';

const TZ = 'America/Chicago';
const OFFICE = 'teo.marchetti@bluestem-comfort.test';
const XSRF = 'X-XSRF-TOKEN';

let ctx: TestContext;
let catcher: SmtpCatcher;
let now = new Date();
let office: Signed;

type Db = TestContext['database']['db'];

/** A household of our own with one property; optional geothermal equipment, plan agreement and portal sign-in. */
async function household(opts: { geo?: boolean; planCode?: string; homeowner?: boolean } = {}) {
  const db: Db = ctx.database.db;
  const tag = randomUUID().slice(0, 8);
  const email = `booking-${tag}@example.test`;
  const [c] = await db
    .insert(t.customers)
    .values({ name: `Test household ${tag}`, email })
    .returning();
  const [p] = await db
    .insert(t.properties)
    .values({ customerId: c!.id, street: `${tag} Test Row`, city: 'Larkspur Bend', state: 'MO', zip: '64790', area: 'Riverside' })
    .returning();
  if (opts.geo) await db.insert(t.equipment).values({ propertyId: p!.id, kind: 'geothermal_heat_pump', make: 'Testmake' });
  if (opts.planCode) {
    const [v] = await db
      .select({ id: t.planVersions.id, price: t.planVersions.yearlyPriceCents })
      .from(t.planVersions)
      .innerJoin(t.plans, eq(t.plans.id, t.planVersions.planId))
      .where(eq(t.plans.code, opts.planCode))
      .limit(1);
    await db
      .insert(t.agreements)
      .values({ customerId: c!.id, propertyId: p!.id, planVersionId: v!.id, status: 'active', startsOn: '2030-01-01', endsOn: '2032-12-31', priceCents: v!.price });
  }
  if (opts.homeowner) await db.insert(t.users).values({ email, name: `Homeowner ${tag}`, role: 'homeowner', customerId: c!.id });
  return { customerId: c!.id, propertyId: p!.id, email };
}

const local = (iso: string) => DateTime.fromISO(iso, { zone: TZ });

/** Time off for every geothermal technician all `day`, but 10 to 12 for the first: one slot for geothermal work. */
async function leaveOneGeothermalSlot(day: DateTime, reason: string): Promise<void> {
  const db: Db = ctx.database.db;
  const geo = await db
    .select({ id: t.technicians.id })
    .from(t.technicians)
    .where(and(eq(t.technicians.active, true), sql`'geothermal' = any(${t.technicians.skills})`));
  expect(geo.length).toBeGreaterThan(0);
  for (const [i, g] of geo.entries()) {
    const spans =
      i === 0
        ? [
            [day, day.set({ hour: 10 })],
            [day.set({ hour: 12 }), day.plus({ days: 1 })],
          ]
        : [[day, day.plus({ days: 1 })]];
    for (const [a, b] of spans) await db.insert(t.technicianTimeOff).values({ technicianId: g.id, startsAt: a!.toJSDate(), endsAt: b!.toJSDate(), reason });
  }
}

/** The calendar attachment of the newest mail to an address, parsed with ical.js and its own VTIMEZONE. */
async function invitationFor(to: string, subject: string) {
  const found = catcher.store.list({ to }).find((m) => m.subject === subject);
  if (!found) throw new Error(`no mail "${subject}" for ${to}`);
  const att = found.attachments.find((a) => a.contentType.startsWith('text/calendar'));
  if (!att) throw new Error(`mail "${subject}" has no calendar attachment`);
  const text = att.content.toString('utf8');
  const cal = new ICAL.Component(ICAL.parse(text));
  for (const z of cal.getAllSubcomponents('vtimezone')) ICAL.TimezoneService.register(z);
  const event = new ICAL.Event(cal.getFirstSubcomponent('vevent')!);
  return { mail: found, att, text, cal, event };
}

async function waitForMail(to: string, subject: string, timeoutMs = 5000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (catcher.store.list({ to }).some((m) => m.subject === subject)) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail "${subject}" for ${to} within ${timeoutMs} ms`);
}

beforeAll(async () => {
  catcher = await startSmtpCatcher({ port: 0 });
  const mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${catcher.port}`, from: 'Bluestem Comfort <office@bluestem-comfort.test>' });
  ctx = testApp({ clock: () => now, mailer });
});

/** Moves the clock and signs the office in again (staff sessions idle out after 30 minutes). */
async function at(iso: string): Promise<Signed> {
  now = new Date(iso);
  office = await signInStaff(ctx, OFFICE);
  return office;
}

afterAll(async () => {
  ctx.deps.mailer.close();
  await catcher.close();
  await ctx.close();
});

describe('arrival windows', () => {
  it('answers windows from what is free, with the member promise marked', async () => {
    const h = await household({ planCode: 'priority-comfort' });
    await at('2031-05-05T13:00:00Z'); // Mon 5 May 2031, 8 am CDT
    const res = await office.agent.get('/api/booking/windows').query({ propertyId: h.propertyId, reason: 'no_cooling', days: 3 }).expect(200);
    expect(res.body.member).toBe(true);
    expect(res.body.priorityWindowHours).toBe(24); // the seeded Priority Comfort tier promises 24 h
    const windows = res.body.windows as { start: string; end: string; capacity: number; meetsPriorityPromise: boolean }[];
    expect(windows.length).toBeGreaterThan(3);
    // Lead time of 120 minutes from 8 am: nothing may start before 10 am local.
    for (const w of windows) expect(Date.parse(w.start)).toBeGreaterThanOrEqual(now.getTime() + 120 * 60_000);
    // The whole window must close within 24 h of the call for the promise to hold.
    for (const w of windows) expect(w.meetsPriorityPromise).toBe(Date.parse(w.end) <= now.getTime() + 24 * 3_600_000);
    expect(windows.some((w) => w.meetsPriorityPromise)).toBe(true);
    expect(windows.some((w) => !w.meetsPriorityPromise)).toBe(true);
  });

  it('names the field for bad input and never answers NaN', async () => {
    await at('2031-05-05T13:00:00Z');
    const res = await office.agent.get('/api/booking/windows').query({ propertyId: 'nope', reason: 'cold' }).expect(422);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['propertyId', 'reason']));
  });

  it('keeps another household out: a homeowner sees only their own properties', async () => {
    const mine = await household({ homeowner: true });
    const theirs = await household();
    now = new Date('2031-05-05T13:00:00Z');
    const me = await signInHomeowner(ctx, mine.email);
    await me.agent.get('/api/booking/windows').query({ propertyId: theirs.propertyId, reason: 'noise' }).expect(422);
    const opts = await me.agent.get('/api/booking/options').expect(200);
    expect(opts.body.properties.map((p: { id: string }) => p.id)).toEqual([mine.propertyId]);
  });
});

describe('booking a visit', () => {
  it('refuses a booking until the caller confirms no emergency sign applies', async () => {
    const h = await household();
    await at('2031-05-05T13:00:00Z');
    const res = await office.agent
      .post('/api/booking/visits')
      .set(XSRF, office.csrf)
      .send({ propertyId: h.propertyId, reason: 'no_heat', windowStart: '2031-05-06T09:30:00-05:00' })
      .expect(422);
    expect(res.body.error.fields.noEmergency).toMatch(/gas/);
  });

  it('50 callers race for the last slot in a window: exactly one is booked, 49 hear it just filled', async () => {
    const { db } = ctx.database;
    await at('2031-06-09T15:00:00Z'); // Mon 9 Jun 2031, 10 am CDT
    const day = local('2031-06-10T00:00'); // Tue 10 Jun 2031
    // Only technicians with the geothermal skill can take these calls; leave one of them a single 10–12 slot.
    await leaveOneGeothermalSlot(day, 'race test');
    const homes = [];
    for (let i = 0; i < 50; i++) homes.push(await household({ geo: true }));

    const offer = await office.agent.get('/api/booking/windows').query({ propertyId: homes[0]!.propertyId, reason: 'no_cooling', from: '2031-06-10', days: 1 }).expect(200);
    const onDay = (offer.body.windows as { start: string; capacity: number }[]).filter((w) => w.start.startsWith('2031-06-10'));
    expect(onDay).toHaveLength(1);
    expect(onDay[0]!.capacity).toBe(1);
    const windowStart = onDay[0]!.start;

    const answers = await Promise.all(
      homes.map((h) =>
        office.agent
          .post('/api/booking/visits')
          .set(XSRF, office.csrf)
          .send({ propertyId: h.propertyId, reason: 'no_cooling', windowStart, noEmergency: true, symptoms: ['Fan runs but air is warm'] }),
      ),
    );
    const statuses = answers.map((r) => r.status);
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(49);
    for (const r of answers.filter((a) => a.status === 409)) {
      expect(r.body.error.code).toBe('window_full');
      expect(r.body.error.message).toMatch(/just filled/);
      expect(r.body.alternatives.length).toBeGreaterThan(0);
      for (const w of r.body.alternatives) expect(Date.parse(w.start)).toBeGreaterThan(Date.parse(windowStart));
    }
    const booked = await db
      .select({ id: t.visits.id })
      .from(t.visits)
      .where(
        inArray(
          t.visits.propertyId,
          homes.map((h) => h.propertyId),
        ),
      );
    expect(booked).toHaveLength(1);
  }, 60_000);

  it('never offers a window that a finished visit still holds: what the route offers, the booking takes', async () => {
    const { db } = ctx.database;
    await at('2032-09-14T12:00:00Z'); // Tue 14 Sep 2032, 7 am CDT (a day no other test books)
    const day = local('2032-09-14T00:00');
    // As in the race above: only geothermal technicians, and one of them free from 10 to 12 alone.
    await leaveOneGeothermalSlot(day, 'finished visit test');
    const [first, second] = [await household({ geo: true }), await household({ geo: true })];
    const onDay = async (propertyId: string) =>
      (
        (await office.agent.get('/api/booking/windows').query({ propertyId, reason: 'no_cooling', from: '2032-09-14', days: 1 }).expect(200)).body.windows as { start: string }[]
      ).filter((w) => w.start.startsWith('2032-09-14'));
    const [slot] = await onDay(first.propertyId);
    expect(slot).toBeDefined();
    const booked = await office.agent
      .post('/api/booking/visits')
      .set(XSRF, office.csrf)
      .send({ propertyId: first.propertyId, reason: 'no_cooling', windowStart: slot!.start, noEmergency: true })
      .expect(201);
    // The technician finishes it; the visit keeps its booked time, and the database's overlap rule still counts it.
    await db.update(t.visits).set({ status: 'done' }).where(eq(t.visits.id, booked.body.visit.id));
    expect(await onDay(second.propertyId)).toEqual([]);
    const again = await office.agent
      .post('/api/booking/visits')
      .set(XSRF, office.csrf)
      .send({ propertyId: second.propertyId, reason: 'no_cooling', windowStart: slot!.start, noEmergency: true })
      .expect(409);
    expect(again.body.error.code).toBe('window_full');
  });

  it('confirms by e-mail with an invitation; reschedule raises SEQUENCE, cancel sends METHOD:CANCEL, across the spring clock change', async () => {
    const h = await household({ homeowner: true });
    now = new Date('2031-03-03T15:00:00Z'); // Mon 3 Mar 2031, 9 am CST
    const me = await signInHomeowner(ctx, h.email);
    // US rule since 2007 (IANA tz "US"): clocks spring forward on the second Sunday of March, 9 Mar 2031.
    expect(local('2031-03-07T12:00').offset).toBe(-360);
    expect(local('2031-03-10T12:00').offset).toBe(-300);

    const before = await me.agent.get('/api/booking/windows').query({ propertyId: h.propertyId, reason: 'noise', from: '2031-03-07', days: 1 }).expect(200);
    const friday = (before.body.windows as { start: string; localLabel: string }[]).find((w) => w.start === '2031-03-07T09:30:00-06:00');
    expect(friday).toBeDefined();
    const booked = await me.agent
      .post('/api/booking/visits')
      .set(XSRF, me.csrf)
      .send({ propertyId: h.propertyId, reason: 'noise', windowStart: friday!.start, noEmergency: true, notes: 'Rattle at start-up' })
      .expect(201);
    expect(booked.body.visit.status).toBe('requested');
    await waitForMail(h.email, 'We have your visit request');
    const first = await invitationFor(h.email, 'We have your visit request');
    // A request is not confirmed yet: TENTATIVE (RFC 5545 §3.8.1.11), and no technician is named.
    expect(first.event.component.getFirstPropertyValue('status')).toBe('TENTATIVE');
    expect(first.text).not.toMatch(/technician:/i);
    expect(first.mail.text).not.toMatch(/Your technician:/);
    expect(first.mail.text).toMatch(/Requested: the office has not yet confirmed this window or assigned a technician/);
    expect(first.att.contentType).toMatch(/^text\/calendar/);
    expect(first.cal.getFirstPropertyValue('method')).toBe('REQUEST'); // RFC 5546 §3.2.2
    expect(first.text).toMatch(/BEGIN:VTIMEZONE[\s\S]*TZID:America\/Chicago/); // RFC 5545 §3.6.5
    expect(first.event.startDate.zone.tzid).toBe(TZ);
    // 09:30 CST (UTC−6) is 15:30 UTC; the window is 2 hours (IANA tz data for America/Chicago).
    expect(first.event.startDate.toJSDate().toISOString()).toBe('2031-03-07T15:30:00.000Z');
    expect(first.event.endDate.toJSDate().toISOString()).toBe('2031-03-07T17:30:00.000Z');
    expect(first.event.sequence).toBe(0);
    expect(first.mail.text).toMatch(/Fri 7 Mar, 9:30–11:30 am/);
    // 24 h before 9:30 am CST on Fri 7 Mar is 9:30 am on Thu 6 Mar.
    expect(first.mail.text).toMatch(/You can change this visit online until Thu 6 Mar, 9:30 AM\./);
    const uid = first.event.uid;

    const after = await me.agent
      .get('/api/booking/windows')
      .query({ propertyId: h.propertyId, reason: 'noise', from: '2031-03-10', days: 1, visitId: booked.body.visit.id })
      .expect(200);
    const monday = (after.body.windows as { start: string }[]).find((w) => w.start === '2031-03-10T09:30:00-05:00');
    expect(monday).toBeDefined();
    await me.agent.post(`/api/booking/visits/${booked.body.visit.id}/reschedule`).set(XSRF, me.csrf).send({ windowStart: monday!.start }).expect(200);
    await waitForMail(h.email, 'Your visit has a new arrival window');
    const second = await invitationFor(h.email, 'Your visit has a new arrival window');
    expect(second.event.uid).toBe(uid); // RFC 5545 §3.8.4.7: same UID replaces the event
    expect(second.event.sequence).toBe(1); // RFC 5546 §2.1.4: SEQUENCE rises on each revision
    // 09:30 CDT (UTC−5) is 14:30 UTC: the same wall-clock time one hour earlier in UTC after the change.
    expect(second.event.startDate.toJSDate().toISOString()).toBe('2031-03-10T14:30:00.000Z');
    expect(second.event.startDate.zone.tzid).toBe(TZ);
    expect([first.event.startDate.hour, first.event.startDate.minute]).toEqual([9, 30]);
    expect([second.event.startDate.hour, second.event.startDate.minute]).toEqual([9, 30]);

    await me.agent.post(`/api/booking/visits/${booked.body.visit.id}/cancel`).set(XSRF, me.csrf).send({}).expect(200);
    await waitForMail(h.email, 'Your visit is canceled');
    const third = await invitationFor(h.email, 'Your visit is canceled');
    expect(third.cal.getFirstPropertyValue('method')).toBe('CANCEL'); // RFC 5546 §3.2.5
    expect(third.event.component.getFirstPropertyValue('status')).toBe('CANCELLED');
    expect(third.event.uid).toBe(uid);
    expect(third.event.sequence).toBe(2);
  }, 30_000);

  it('fall back: a window on each side of the November change keeps its wall-clock time', async () => {
    const h = await household();
    await at('2031-10-27T15:00:00Z');
    // IANA tz "US" rule: clocks fall back on the first Sunday of November, 2 Nov 2031.
    const fri = await office.agent.get('/api/booking/windows').query({ propertyId: h.propertyId, reason: 'thermostat', from: '2031-10-31', days: 3 }).expect(200);
    const starts = (fri.body.windows as { start: string }[]).map((w) => w.start);
    expect(starts).toContain('2031-10-31T13:30:00-05:00');
    expect(starts).toContain('2031-11-03T13:30:00-06:00');
    expect(starts.some((s) => s.startsWith('2031-11-02'))).toBe(false); // Sunday: the office is closed
  });

  it('closes online changes at the cut-off, while the office can still move the visit', async () => {
    const h = await household({ homeowner: true });
    now = new Date('2031-04-07T13:00:00Z'); // Mon 8 am CDT
    const me = await signInHomeowner(ctx, h.email);
    const offer = await me.agent.get('/api/booking/windows').query({ propertyId: h.propertyId, reason: 'water_leak', from: '2031-04-09', days: 1 }).expect(200);
    const w = offer.body.windows[0];
    const booked = await me.agent
      .post('/api/booking/visits')
      .set(XSRF, me.csrf)
      .send({ propertyId: h.propertyId, reason: 'water_leak', windowStart: w.start, noEmergency: true })
      .expect(201);
    expect(booked.body.visit.canChange).toBe(true);
    expect(booked.body.visit.changeNotice).toMatch(/^You can change this visit online until Tue 8 Apr, /);
    now = new Date(Date.parse(w.start) - 23 * 3_600_000); // 23 h before: inside the 24 h default cut-off
    const late = await me.agent.post(`/api/booking/visits/${booked.body.visit.id}/cancel`).set(XSRF, me.csrf).send({}).expect(409);
    expect(late.body.error.code).toBe('past_cutoff');
    expect(late.body.error.message).toMatch(/by phone: \(\d{3}\) \d{3}-\d{4}\./);
    const page = await me.agent.get(`/api/booking/visits/${booked.body.visit.id}`).expect(200);
    expect(page.body.visit.canChange).toBe(false);
    expect(page.body.visit.changeNotice).toBe(`Changes to this visit are by phone: ${formatPhone(page.body.visit.officePhone, 'US')}.`);
    await at(now.toISOString());
    await office.agent.post(`/api/booking/visits/${booked.body.visit.id}/cancel`).set(XSRF, office.csrf).send({ reason: 'Caller phoned in' }).expect(200);
  });

  it('a visit booked inside the cut-off says at booking that changes are by phone, the same as its page', async () => {
    const h = await household({ homeowner: true });
    now = new Date('2031-04-21T13:00:00Z'); // Mon 8 am CDT
    const me = await signInHomeowner(ctx, h.email);
    const offer = await me.agent.get('/api/booking/windows').query({ propertyId: h.propertyId, reason: 'thermostat', from: '2031-04-21', days: 1 }).expect(200);
    const w = (offer.body.windows as { start: string }[]).find((x) => Date.parse(x.start) - now.getTime() < 24 * 3_600_000)!;
    expect(w).toBeDefined();
    const booked = await me.agent
      .post('/api/booking/visits')
      .set(XSRF, me.csrf)
      .send({ propertyId: h.propertyId, reason: 'thermostat', windowStart: w.start, noEmergency: true })
      .expect(201);
    expect(booked.body.visit.canChange).toBe(false);
    expect(booked.body.visit.changeNotice).toMatch(/^Changes to this visit are by phone: \(\d{3}\) \d{3}-\d{4}\.$/);
    await waitForMail(h.email, 'We have your visit request');
    const mail = catcher.store.list({ to: h.email }).find((m) => m.subject === 'We have your visit request')!;
    expect(mail.text).toContain(booked.body.visit.changeNotice);
    expect(mail.text).not.toMatch(/change this visit online/);
    const page = await me.agent.get(`/api/booking/visits/${booked.body.visit.id}`).expect(200);
    expect(page.body.visit.changeNotice).toBe(booked.body.visit.changeNotice);
    await me.agent.post(`/api/booking/visits/${booked.body.visit.id}/cancel`).set(XSRF, me.csrf).send({}).expect(409);
  });

  it("links the homeowner's booking photo to the visit for the technician, and refuses another household's file", async () => {
    const h = await household({ homeowner: true });
    const other = await household({ homeowner: true });
    now = new Date('2031-04-28T13:00:00Z');
    const me = await signInHomeowner(ctx, h.email);
    const them = await signInHomeowner(ctx, other.email);
    const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#806040' } })
      .jpeg()
      .toBuffer();
    const uploadAs = async (s: Signed, propertyId: string) =>
      (
        await s.agent
          .post('/api/files')
          .set(XSRF, s.csrf)
          .field('propertyId', propertyId)
          .field('category', 'problem')
          .attach('files', jpeg, { filename: 'leak.jpg', contentType: 'image/jpeg' })
          .expect(201)
      ).body;
    const mine = await uploadAs(me, h.propertyId);
    const theirs = await uploadAs(them, other.propertyId);
    const mineId = (mine.files ?? mine)[0].id as string;
    const theirsId = (theirs.files ?? theirs)[0].id as string;
    const offer = await me.agent.get('/api/booking/windows').query({ propertyId: h.propertyId, reason: 'water_leak', from: '2031-04-30', days: 1 }).expect(200);
    const w = offer.body.windows[0];
    const refused = await me.agent
      .post('/api/booking/visits')
      .set(XSRF, me.csrf)
      .send({ propertyId: h.propertyId, reason: 'water_leak', windowStart: w.start, noEmergency: true, photoIds: [mineId, theirsId] })
      .expect(422);
    expect(refused.body.error.fields.photoIds).toMatch(/not found/);
    const [still] = await ctx.database.db.select({ visitId: t.files.visitId }).from(t.files).where(eq(t.files.id, theirsId));
    expect(still!.visitId).toBeNull();
    const none = await ctx.database.db.select({ id: t.visits.id }).from(t.visits).where(eq(t.visits.propertyId, h.propertyId));
    expect(none).toHaveLength(0); // the refused booking left nothing behind

    const booked = await me.agent
      .post('/api/booking/visits')
      .set(XSRF, me.csrf)
      .send({ propertyId: h.propertyId, reason: 'water_leak', windowStart: w.start, noEmergency: true, photoIds: [mineId] })
      .expect(201);
    const owner = await signInStaff(ctx, 'rosalind.okafor@bluestem-comfort.test');
    const field = await owner.agent.get(`/api/field/visits/${booked.body.visit.id}`).expect(200);
    expect(field.body.photos.map((p: { id: string }) => p.id)).toEqual([mineId]);
  });

  it('groups service history by what is coming up and what is past, in date order, and flags a window that passed unstarted', async () => {
    const h = await household({ homeowner: true });
    const db: Db = ctx.database.db;
    const visit = async (day: string, status: 'done' | 'scheduled' | 'requested', reason: 'tune_up' | 'noise') => {
      const s = local(`${day}T09:00`);
      const [v] = await db
        .insert(t.visits)
        .values({
          customerId: h.customerId,
          propertyId: h.propertyId,
          kind: reason === 'tune_up' ? 'tune_up' : 'service_call',
          reason,
          status,
          windowStart: s.toJSDate(),
          windowEnd: s.plus({ hours: 2 }).toJSDate(),
          startsAt: s.toJSDate(),
          endsAt: s.plus({ minutes: 90 }).toJSDate(),
        })
        .returning({ id: t.visits.id });
      return v!.id;
    };
    // Inserted out of order on purpose; "now" is Wed 3 Dec 2031, noon.
    const dec2 = await visit('2031-12-02', 'done', 'noise');
    const dec10 = await visit('2031-12-10', 'scheduled', 'tune_up');
    const dec1 = await visit('2031-12-01', 'done', 'tune_up');
    const missed = await visit('2031-12-03', 'scheduled', 'noise'); // 9–11 am today, never started
    const dec5 = await visit('2031-12-05', 'requested', 'noise');
    await at('2031-12-03T18:00:00Z');
    const me = await signInHomeowner(ctx, h.email);
    const home = (await me.agent.get('/api/my-home').expect(200)).body;
    expect(home.upcoming.map((v: { id: string }) => v.id)).toEqual([dec5, dec10]);
    expect(home.past.map((v: { id: string }) => v.id)).toEqual([missed, dec2, dec1]);

    const page = (await office.agent.get(`/api/customers/${h.customerId}`).expect(200)).body;
    const flagged = page.visits.filter((v: { windowMissed: boolean }) => v.windowMissed).map((v: { id: string }) => v.id);
    expect(flagged).toEqual([missed]);
    expect(page.visits.find((v: { id: string }) => v.id === missed).status).toBe('scheduled'); // flagged, not changed
    expect(page.timeline.some((e: { title: string }) => e.title.includes('window passed, not started'))).toBe(true);
    const board = (await office.agent.get('/api/dispatch/board').query({ from: '2031-12-03', days: 1 }).expect(200)).body;
    const onBoard = [...board.visits, ...board.unassigned].find((v: { id: string }) => v.id === missed);
    expect(onBoard.windowMissed).toBe(true);
  });

  it('names no technician to the homeowner while the visit is only requested, on the home card and in My home', async () => {
    const h = await household({ homeowner: true });
    await at('2032-10-04T13:00:00Z'); // Mon 4 Oct 2032, 8 am CDT
    const offer = await office.agent.get('/api/booking/windows').query({ propertyId: h.propertyId, reason: 'noise', from: '2032-10-05', days: 1 }).expect(200);
    const booked = await office.agent
      .post('/api/booking/visits')
      .set(XSRF, office.csrf)
      .send({ propertyId: h.propertyId, reason: 'noise', windowStart: offer.body.windows[0].start, noEmergency: true })
      .expect(201);
    const id = booked.body.visit.id as string;
    // The booking already holds a technician's time; the request names none until the office confirms.
    const [held] = await ctx.database.db.select({ technicianId: t.visits.technicianId }).from(t.visits).where(eq(t.visits.id, id));
    expect(held!.technicianId).not.toBeNull();
    const me = await signInHomeowner(ctx, h.email);
    const told = async () => ({
      card: (await me.agent.get('/api/my-home/summary').expect(200)).body.nextVisit,
      history: (await me.agent.get('/api/my-home').expect(200)).body.upcoming.find((v: { id: string }) => v.id === id),
    });
    const before = await told();
    expect(before.card).toMatchObject({ id, status: 'requested', technicianName: null });
    expect(before.history.technicianName).toBeNull();
    await office.agent.post(`/api/dispatch/visits/${id}/assign`).set(XSRF, office.csrf).send({ technicianId: held!.technicianId }).expect(200);
    const after = await told();
    expect(after.card.status).toBe('scheduled');
    expect(after.card.technicianName).toEqual(expect.any(String));
    expect(after.history.technicianName).toBe(after.card.technicianName);
  });

  it('sends the day-before reminder once', async () => {
    const h = await household();
    await at('2031-04-14T13:00:00Z');
    const offer = await office.agent.get('/api/booking/windows').query({ propertyId: h.propertyId, reason: 'tune_up', from: '2031-04-15', days: 1 }).expect(200);
    const w = offer.body.windows[0];
    await office.agent
      .post('/api/booking/visits')
      .set(XSRF, office.csrf)
      .send({ propertyId: h.propertyId, reason: 'tune_up', windowStart: w.start, noEmergency: true })
      .expect(201);
    now = new Date(Date.parse(w.start) - 20 * 3_600_000);
    expect(await sendDayBeforeReminders(ctx.deps)).toBeGreaterThanOrEqual(1);
    await waitForMail(h.email, 'Reminder: your visit is tomorrow');
    await sendDayBeforeReminders(ctx.deps);
    expect(catcher.store.list({ to: h.email }).filter((m) => m.subject === 'Reminder: your visit is tomorrow')).toHaveLength(1);
  });
});
