import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { sendAssignmentNotice, VISIT_NOTICE_JOB } from '../server/booking/assignment-notice';
import { and, eq, sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { testApp, type TestContext } from './support/app';
import { anonymous, signInStaff, type Signed } from './support/auth';
import { startSmtpCatcher, type SmtpCatcher } from '../server/fakes/mail';
import { createMailer } from '../server/integrations/mail';
import * as t from '../server/db/schema';
import { parseCalendar } from './support/calendar';

const OFFICE = 'teo.marchetti@bluestem-comfort.test';
const PRIYA = 'priya.dunmore@bluestem-comfort.test';
const ELI = 'eli.castellan@bluestem-comfort.test';
const MARCUS = 'marcus.bellweather@bluestem-comfort.test';
const XSRF = 'X-XSRF-TOKEN';

let ctx: TestContext;
let catcher: SmtpCatcher;
let now = new Date();

async function at(iso: string, email = OFFICE): Promise<Signed> {
  now = new Date(iso);
  return signInStaff(ctx, email);
}

async function household(opts: { geo?: boolean } = {}) {
  const db = ctx.database.db;
  const tag = randomUUID().slice(0, 8);
  const email = `dispatch-${tag}@example.test`;
  const [c] = await db
    .insert(t.customers)
    .values({ name: `Dispatch household ${tag}`, email })
    .returning();
  const [p] = await db
    .insert(t.properties)
    .values({ customerId: c!.id, street: `${tag} Board Lane`, city: 'Larkspur Bend', state: 'MO', zip: '64790', area: `Area ${tag}` })
    .returning();
  if (opts.geo) await db.insert(t.equipment).values({ propertyId: p!.id, kind: 'geothermal_heat_pump' });
  return { customerId: c!.id, propertyId: p!.id, email, area: `Area ${tag}` };
}

async function techId(email: string): Promise<string> {
  const [row] = await ctx.database.db.select({ id: t.technicians.id }).from(t.technicians).innerJoin(t.users, eq(t.users.id, t.technicians.userId)).where(eq(t.users.email, email));
  return row!.id;
}

async function book(office: Signed, propertyId: string, reason: string, from: string, pick = 0) {
  const offer = await office.agent.get('/api/booking/windows').query({ propertyId, reason, from, days: 1 }).expect(200);
  const w = offer.body.windows[pick];
  const res = await office.agent.post('/api/booking/visits').set(XSRF, office.csrf).send({ propertyId, reason, windowStart: w.start, noEmergency: true }).expect(201);
  return res.body.visit as { id: string; startsAt: string; endsAt: string; technicianId: string; status: string };
}

async function waitForMail(to: string, subject: string, timeoutMs = 5000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const m = catcher.store.list({ to }).find((x) => x.subject === subject);
    if (m) return m;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail "${subject}" for ${to}`);
}

beforeAll(async () => {
  catcher = await startSmtpCatcher({ port: 0 });
  const mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${catcher.port}`, from: 'Bluestem Comfort <office@bluestem-comfort.test>' });
  ctx = testApp({ clock: () => now, mailer });
});

afterAll(async () => {
  ctx.deps.mailer.close();
  await catcher.close();
  await ctx.close();
});

describe('dispatch board', () => {
  it('shows a new request in the queue; assigning schedules it, records who and when, and tells the homeowner', async () => {
    const office = await at('2031-07-07T13:00:00Z'); // Mon 7 Jul 2031
    const h = await household();
    const visit = await book(office, h.propertyId, 'noise', '2031-07-08');
    const board = await office.agent.get('/api/dispatch/board').query({ from: '2031-07-08', days: 1, area: h.area }).expect(200);
    expect(board.body.unassigned.map((v: { id: string }) => v.id)).toContain(visit.id);
    expect(board.body.technicians.length).toBeGreaterThan(0);

    const priya = await techId(PRIYA);
    const res = await office.agent.post(`/api/dispatch/visits/${visit.id}/assign`).set(XSRF, office.csrf).send({ technicianId: priya }).expect(200);
    expect(res.body.visit.status).toBe('scheduled');
    expect(res.body.visit.technicianName).toBe('Priya Dunmore');
    expect(res.body.visit.sequence).toBe(1);

    const after = await office.agent.get('/api/dispatch/board').query({ from: '2031-07-08', days: 7, area: h.area }).expect(200);
    expect(after.body.visits.map((v: { id: string }) => v.id)).toContain(visit.id);
    expect(after.body.unassigned.map((v: { id: string }) => v.id)).not.toContain(visit.id);

    const events = await office.agent.get(`/api/dispatch/visits/${visit.id}/events`).expect(200);
    expect(events.body.events.map((e: { action: string }) => e.action)).toEqual(['booked', 'assigned']);
    expect(events.body.events[1].actorName).toBe('Teo Marchetti');
    expect(events.body.events[1].technicianName).toBe('Priya Dunmore');
    expect(Date.parse(events.body.events[1].at)).not.toBeNaN();

    const mail = await waitForMail(h.email, 'Your visit is scheduled');
    expect(mail.text).toMatch(/Priya Dunmore/);
    expect(mail.text).toMatch(/Scheduled: the office confirmed this window and assigned your technician/);
    const ics = mail.attachments.find((a) => a.contentType.startsWith('text/calendar'))!.content.toString('utf8');
    const parsed = parseCalendar(ics).events[0]!;
    expect(parsed.component.getFirstPropertyValue('status')).toBe('CONFIRMED'); // RFC 5545 §3.8.1.11
    expect(parsed.sequence).toBe(1); // RFC 5546 §2.1.4: a revision raises SEQUENCE
  });

  it('lists every request waiting to be confirmed, whatever day the board shows', async () => {
    const office = await at('2031-08-04T13:00:00Z'); // Mon 4 Aug 2031
    const h = await household();
    const later = await Promise.all(['2031-08-05', '2031-08-06', '2031-08-07', '2031-08-08'].map((d) => book(office, h.propertyId, 'tune_up', d)));
    const day = await office.agent.get('/api/dispatch/board').query({ from: '2031-08-04', days: 1, area: h.area }).expect(200);
    expect(day.body.visits).toHaveLength(0);
    expect(day.body.unassigned.map((v: { id: string }) => v.id)).toEqual(later.map((v) => v.id)); // soonest first
    const week = await office.agent.get('/api/dispatch/board').query({ from: '2031-08-04', days: 7, area: h.area }).expect(200);
    expect(week.body.unassigned).toHaveLength(4);
  });

  it('shows the soonest 50 of a long queue and says how many wait in all', async () => {
    const office = await at('2031-09-01T13:00:00Z');
    const h = await household();
    const first = Date.parse('2031-09-02T14:00:00Z');
    // Inserted latest first, so only the order the board asks for puts them soonest first.
    const rows = Array.from({ length: 53 }, (_, i) => {
      const start = new Date(first + (52 - i) * 3_600_000);
      const end = new Date(start.getTime() + 2 * 3_600_000);
      return {
        customerId: h.customerId,
        propertyId: h.propertyId,
        kind: 'service_call' as const,
        reason: 'noise' as const,
        status: 'requested' as const,
        windowStart: start,
        windowEnd: end,
        startsAt: start,
        endsAt: end,
      };
    });
    await ctx.database.db.insert(t.visits).values(rows);
    const board = await office.agent.get('/api/dispatch/board').query({ from: '2031-09-02', days: 1, area: h.area }).expect(200);
    expect(board.body.unassignedTotal).toBe(53);
    expect(board.body.unassigned).toHaveLength(50);
    const starts = board.body.unassigned.map((v: { windowStart: string }) => Date.parse(v.windowStart));
    expect(starts[0]).toBe(first);
    expect(starts).toEqual([...starts].sort((a, b) => a - b));
    expect(board.body.visits).toHaveLength(0);
    expect(board.body.areas).toContain(h.area);
    expect(board.body.areas).toEqual([...new Set(board.body.areas)].sort());
  });

  it('tells the homeowner once the assignment settles, and nothing for a reshuffle inside the window', async () => {
    const office = await at('2031-10-06T13:00:00Z'); // Mon 6 Oct 2031
    const h = await household();
    const visit = await book(office, h.propertyId, 'noise', '2031-10-07');
    const [priya, eli, marcus] = await Promise.all([PRIYA, ELI, MARCUS].map(techId));
    const assign = (technicianId: string, startsAt?: string) =>
      office.agent
        .post(`/api/dispatch/visits/${visit.id}/assign`)
        .set(XSRF, office.csrf)
        .send({ technicianId, ...(startsAt ? { startsAt } : {}) })
        .expect(200);
    const told = () => catcher.store.list({ to: h.email }).filter((m) => m.subject === 'Your visit is scheduled' || m.subject === 'Your visit has a new arrival window');

    // Hold the notice jobs the way pg-boss would for the delay, and look at how they are queued.
    const held: { data: { visitId: string }; opts: { startAfter?: number; singletonKey?: string } }[] = [];
    const real = ctx.deps.jobs.send.bind(ctx.deps.jobs);
    const spy = vi.spyOn(ctx.deps.jobs, 'send').mockImplementation(async (name, data, opts = {}) => {
      if (name !== VISIT_NOTICE_JOB) return real(name, data, opts);
      held.push({ data: data as { visitId: string }, opts: opts as { startAfter?: number; singletonKey?: string } });
      return 'held';
    });
    try {
      await assign(priya);
      await assign(eli);
      await assign(marcus);
      expect(held.length).toBeGreaterThan(0);
      expect(held.every((j) => j.opts.startAfter! > 0 && j.opts.singletonKey === visit.id)).toBe(true);
      expect(told()).toHaveLength(0); // nothing while the office is still moving it
    } finally {
      spy.mockRestore();
    }
    expect(await sendAssignmentNotice(ctx.deps, visit.id)).toBe('sent');
    expect(await sendAssignmentNotice(ctx.deps, visit.id)).toBe('unchanged'); // the queued duplicates send nothing
    await waitForMail(h.email, 'Your visit is scheduled');
    expect(told()).toHaveLength(1);
    expect(told()[0]!.text).toMatch(/Marcus Bellweather/);

    // The same technician starts 30 minutes later, still inside the window the homeowner has: no e-mail.
    const current = (await office.agent.get('/api/dispatch/board').query({ from: '2031-10-07', days: 1, area: h.area }).expect(200)).body.visits.find(
      (v: { id: string }) => v.id === visit.id,
    );
    const later = new Date(Date.parse(current.startsAt) + 30 * 60_000).toISOString();
    const moved = await assign(marcus, later);
    expect(moved.body.visit.windowStart).toBe(current.windowStart);
    expect(await sendAssignmentNotice(ctx.deps, visit.id)).toBe('unchanged');
    await new Promise((r) => setTimeout(r, 300));
    expect(told()).toHaveLength(1);
  });

  it('respects skills, time off and existing visits when assigning', async () => {
    const office = await at('2031-07-14T13:00:00Z');
    const geoHome = await household({ geo: true });
    const visit = await book(office, geoHome.propertyId, 'no_heat', '2031-07-15');
    // Eli has no geothermal skill in the demo crew.
    const eli = await techId(ELI);
    const noSkill = await office.agent.post(`/api/dispatch/visits/${visit.id}/assign`).set(XSRF, office.csrf).send({ technicianId: eli }).expect(422);
    expect(noSkill.body.error.fields.technicianId).toMatch(/geothermal/);

    const h = await household();
    const plain = await book(office, h.propertyId, 'thermostat', '2031-07-16');
    const priya = await techId(PRIYA);
    await office.agent
      .post('/api/dispatch/time-off')
      .set(XSRF, office.csrf)
      .send({ technicianId: priya, startsAt: '2031-07-16T00:00:00-05:00', endsAt: '2031-07-17T00:00:00-05:00', reason: 'Training' })
      .expect(201);
    const off = await office.agent.post(`/api/dispatch/visits/${plain.id}/assign`).set(XSRF, office.csrf).send({ technicianId: priya }).expect(422);
    expect(off.body.error.code).toBe('time_off');
    expect(off.body.error.fields.technicianId).toBe('is off at that time');

    // Two visits at the same hour for one technician: the database's EXCLUDE refuses the second.
    const marcus = await techId('marcus.bellweather@bluestem-comfort.test');
    const h2 = await household();
    const h3 = await household();
    const a = await book(office, h2.propertyId, 'noise', '2031-07-17');
    const b = await book(office, h3.propertyId, 'noise', '2031-07-17');
    await office.agent.post(`/api/dispatch/visits/${a.id}/assign`).set(XSRF, office.csrf).send({ technicianId: marcus, startsAt: '2031-07-17T10:00:00-05:00' }).expect(200);
    const clash = await office.agent
      .post(`/api/dispatch/visits/${b.id}/assign`)
      .set(XSRF, office.csrf)
      .send({ technicianId: marcus, startsAt: '2031-07-17T10:30:00-05:00' })
      .expect(409);
    expect(clash.body.error.code).toBe('overlap');
    expect(clash.body.error.message).toMatch(/Marcus Bellweather already has a visit/);
  });

  it('walks the statuses, e-mails "on the way", and refuses a jump that makes no sense', async () => {
    const office = await at('2031-07-21T13:00:00Z');
    const h = await household();
    const visit = await book(office, h.propertyId, 'water_leak', '2031-07-22');
    const jump = await office.agent.post(`/api/dispatch/visits/${visit.id}/status`).set(XSRF, office.csrf).send({ status: 'done' }).expect(422);
    expect(jump.body.error.fields.status).toMatch(/requested/);
    const demoTechs = await Promise.all([PRIYA, ELI, MARCUS].map(techId));
    if (demoTechs.includes(visit.technicianId)) {
      await office.agent.post(`/api/dispatch/visits/${visit.id}/status`).set(XSRF, office.csrf).send({ status: 'scheduled' }).expect(200);
    } else {
      // Other tests add technicians whose passwords this test does not know: hand it to Priya.
      await office.agent.post(`/api/dispatch/visits/${visit.id}/assign`).set(XSRF, office.csrf).send({ technicianId: demoTechs[0], startsAt: visit.startsAt }).expect(200);
    }

    const [row] = await ctx.database.db
      .select({ email: t.users.email })
      .from(t.visits)
      .innerJoin(t.technicians, eq(t.technicians.id, t.visits.technicianId))
      .innerJoin(t.users, eq(t.users.id, t.technicians.userId))
      .where(eq(t.visits.id, visit.id));
    const tech = await at('2031-07-21T13:05:00Z', row!.email);
    const other = await signInStaff(ctx, row!.email === PRIYA ? ELI : PRIYA);
    await other.agent.post(`/api/dispatch/visits/${visit.id}/status`).set(XSRF, other.csrf).send({ status: 'on_the_way' }).expect(404);
    await tech.agent.post(`/api/dispatch/visits/${visit.id}/status`).set(XSRF, tech.csrf).send({ status: 'canceled' }).expect(403);
    await tech.agent.post(`/api/dispatch/visits/${visit.id}/status`).set(XSRF, tech.csrf).send({ status: 'on_the_way' }).expect(200);
    const mail = await waitForMail(h.email, 'Your technician is on the way');
    expect(mail.text).toMatch(/driving to you now/);
    await tech.agent.post(`/api/dispatch/visits/${visit.id}/status`).set(XSRF, tech.csrf).send({ status: 'on_site' }).expect(200);
    const done = await tech.agent.post(`/api/dispatch/visits/${visit.id}/status`).set(XSRF, tech.csrf).send({ status: 'done', note: 'Flushed the condensate line' }).expect(200);
    expect(done.body.visit.status).toBe('done');
    const office2 = await signInStaff(ctx, OFFICE);
    const events = await office2.agent.get(`/api/dispatch/visits/${visit.id}/events`).expect(200);
    expect(events.body.events.map((e: { toStatus: string }) => e.toStatus)).toEqual(['requested', 'scheduled', 'on_the_way', 'on_site', 'done']);
  });

  it('keeps homeowners and technicians off the board', async () => {
    await at('2031-07-21T13:00:00Z');
    const tech = await signInStaff(ctx, PRIYA);
    await tech.agent.get('/api/dispatch/board').query({ from: '2031-07-22' }).expect(403);
    const anon = await anonymous(ctx);
    await anon.agent.get('/api/dispatch/board').query({ from: '2031-07-22' }).expect(401);
  });
});

describe('technician week and calendar feed', () => {
  it('lists the week and serves a private .ics feed that stops when revoked', async () => {
    const office = await at('2031-09-01T13:00:00Z'); // Mon 1 Sep 2031
    const h = await household();
    const visit = await book(office, h.propertyId, 'tune_up', '2031-09-02');
    const priya = await techId(PRIYA);
    await office.agent.post(`/api/dispatch/visits/${visit.id}/assign`).set(XSRF, office.csrf).send({ technicianId: priya }).expect(200);

    const tech = await signInStaff(ctx, PRIYA);
    const week = await tech.agent.get('/api/schedule/week').query({ start: '2031-09-03' }).expect(200);
    expect(week.body.start).toBe('2031-09-01'); // ISO 8601 weeks start on Monday
    expect(week.body.visits.map((v: { id: string }) => v.id)).toContain(visit.id);

    const issued = await tech.agent.post('/api/schedule/feed-token').set(XSRF, tech.csrf).expect(201);
    const path = new URL(issued.body.url).pathname;
    const anon = await anonymous(ctx);
    const feed = await anon.agent.get(path).expect(200);
    expect(feed.headers['content-type']).toMatch(/^text\/calendar/);
    const { events } = parseCalendar(feed.text);
    const ev = events.find((e) => e.uid === `visit-${visit.id}@seasonwell.local`);
    expect(ev).toBeDefined();
    expect(ev!.startDate.toJSDate().toISOString()).toBe(new Date(visit.startsAt).toISOString());
    expect(ev!.startDate.zone.tzid).toBe('America/Chicago'); // resolved from the feed's own VTIMEZONE

    // A new link replaces the old one; revoking ends it.
    const again = await tech.agent.post('/api/schedule/feed-token').set(XSRF, tech.csrf).expect(201);
    await anon.agent.get(path).expect(404);
    await tech.agent.delete('/api/schedule/feed-token').set(XSRF, tech.csrf).expect(204);
    await anon.agent.get(new URL(again.body.url).pathname).expect(404);
    const live = await ctx.database.db
      .select({ n: sql<number>`count(*)` })
      .from(t.calendarFeedTokens)
      .where(and(eq(t.calendarFeedTokens.technicianId, priya), sql`${t.calendarFeedTokens.revokedAt} is null`));
    expect(Number(live[0]!.n)).toBe(0);
  });
});
