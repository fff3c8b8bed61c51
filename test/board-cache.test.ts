import { randomUUID } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDatabase } from '../server/db/client';
import * as t from '../server/db/schema';
import { seedDemo } from '../server/db/seed/seed';
import { testApp, type TestContext } from './support/app';
import { signInStaff, type Signed } from './support/auth';
import { scratchDatabase, type ScratchDatabase } from './support/scratch-db';

// The dispatch board is kept per process while the board's version holds (triggers bump it at the
// commit of every write the board shows) and until a visit on it changes with the clock alone.
// Every check below reads the board, changes one thing, and reads it again at once: a kept board
// that missed the change fails it. Two apps stand for two API processes, each with its own boards.
// The file has a database of its own, so that no other file's writes move the version it counts.
const OFFICE = 'teo.marchetti@bluestem-comfort.test';
const MARCUS = 'marcus.bellweather@bluestem-comfort.test';
const XSRF = 'X-XSRF-TOKEN';
const DAY = '2032-03-09'; // a Tuesday; America/Chicago is on daylight time (UTC−5) from 14 March
let now = new Date('2032-03-08T15:00:00Z');

let a: TestContext;
let b: TestContext;
let officeA: Signed;
let officeB: Signed;
let marcusId: string;

interface BoardVisit {
  id: string;
  customerName: string;
  address: string;
  area: string;
  notes: string;
  planName: string | null;
  technicianName: string | null;
  canChange: boolean;
  windowMissed: boolean;
  status: string;
}
interface Board {
  visits: BoardVisit[];
  unassigned: BoardVisit[];
  technicians: { id: string; name: string; timeOff: { id: string }[] }[];
  areas: string[];
}

async function boardOf(office: Signed, area: string): Promise<Board> {
  return (await office.agent.get('/api/dispatch/board').query({ from: DAY, days: 1, area }).expect(200)).body as Board;
}

async function version(): Promise<number> {
  const [row] = await a.database.db.select({ v: t.boardVersion.version }).from(t.boardVersion);
  return Number(row!.v);
}

/** A household with one home in an area of its own, and one visit on the board (or in the queue). */
async function scene(opts: { queued?: boolean; hour?: number } = {}) {
  const db = a.database.db;
  const tag = randomUUID().slice(0, 8);
  const area = `Board cache ${tag}`;
  const [c] = await db
    .insert(t.customers)
    .values({ name: `Kept board ${tag}`, email: `kept-${tag}@example.test` })
    .returning();
  const [p] = await db
    .insert(t.properties)
    .values({ customerId: c!.id, street: `${tag} Larch Row`, city: 'Larkspur Bend', state: 'MO', zip: '64790', area })
    .returning();
  // Each scene takes its own hour of Marcus's day, so their visits never overlap.
  const start = new Date(`${DAY}T${String(opts.hour ?? 13).padStart(2, '0')}:00:00Z`);
  const end = new Date(start.getTime() + 2 * 3_600_000);
  const [v] = await db
    .insert(t.visits)
    .values({
      customerId: c!.id,
      propertyId: p!.id,
      kind: 'service_call',
      reason: 'no_cooling',
      status: opts.queued ? 'requested' : 'scheduled',
      technicianId: opts.queued ? null : marcusId,
      windowStart: start,
      windowEnd: end,
      startsAt: start,
      endsAt: new Date(start.getTime() + 3_600_000),
    })
    .returning();
  return { area, customerId: c!.id, propertyId: p!.id, visitId: v!.id, tag };
}

const onBoard = (board: Board, id: string) => [...board.visits, ...board.unassigned].find((v) => v.id === id);

let scratch: ScratchDatabase | undefined;

beforeAll(async () => {
  scratch = await scratchDatabase('board');
  const url = new URL(scratch.url);
  const seeding = createDatabase(url.toString(), 2);
  await seedDemo(seeding.db, DateTime.fromISO('2032-01-05T09:00', { zone: 'America/Chicago' }));
  await seeding.close();
  a = testApp({ clock: () => now, database: createDatabase(url.toString(), 3), env: { DATABASE_URL: url.toString() } });
  b = testApp({ clock: () => now, database: createDatabase(url.toString(), 3), env: { DATABASE_URL: url.toString() } });
  officeA = await signInStaff(a, OFFICE);
  officeB = await signInStaff(b, OFFICE);
  const [m] = await a.database.db.select({ id: t.technicians.id }).from(t.technicians).innerJoin(t.users, eq(t.users.id, t.technicians.userId)).where(eq(t.users.email, MARCUS));
  marcusId = m!.id;
}, 120_000);

afterAll(async () => {
  await a?.close();
  await b?.close();
  await scratch?.drop();
}, 60_000);

describe('the kept dispatch board', () => {
  it('shows each change to what it draws at once, in this process and in another', async () => {
    const s = await scene({ hour: 13 });
    const first = await boardOf(officeA, s.area);
    expect(onBoard(first, s.visitId)?.customerName).toBe(`Kept board ${s.tag}`);
    await boardOf(officeB, s.area);
    const db = a.database.db;
    const seen = async (check: (v: BoardVisit | undefined, board: Board) => void) => {
      for (const office of [officeA, officeB]) {
        const board = await boardOf(office, s.area);
        check(onBoard(board, s.visitId), board);
      }
    };

    await db
      .update(t.customers)
      .set({ name: `Renamed ${s.tag}` })
      .where(eq(t.customers.id, s.customerId));
    await seen((v) => expect(v?.customerName).toBe(`Renamed ${s.tag}`));

    await db
      .update(t.properties)
      .set({ street: `${s.tag} Tamarack Court` })
      .where(eq(t.properties.id, s.propertyId));
    await seen((v) => expect(v?.address).toContain('Tamarack Court'));

    await db.update(t.visits).set({ notes: 'Dog in the yard; ring first.' }).where(eq(t.visits.id, s.visitId));
    await seen((v) => expect(v?.notes).toBe('Dog in the yard; ring first.'));

    const [pv] = await db.select({ id: t.planVersions.id }).from(t.planVersions).limit(1);
    const [ag] = await db
      .insert(t.agreements)
      .values({ customerId: s.customerId, propertyId: s.propertyId, planVersionId: pv!.id, status: 'active', startsOn: '2032-01-01', endsOn: '2032-12-31', priceCents: 18900 })
      .returning();
    await seen((v) => expect(v?.planName).not.toBeNull());
    await db.update(t.agreements).set({ status: 'canceled', canceledAt: now }).where(eq(t.agreements.id, ag!.id));
    await seen((v) => expect(v?.planName).toBeNull());

    // Through the office's own routes: time off for the technician, then the visit back to the queue.
    const off = await officeA.agent
      .post('/api/dispatch/time-off')
      .set(XSRF, officeA.csrf)
      .send({ technicianId: marcusId, startsAt: `${DAY}T22:00:00Z`, endsAt: `${DAY}T23:00:00Z`, reason: 'Training' })
      .expect(201);
    await seen((_v, board) => expect(board.technicians.find((x) => x.id === marcusId)?.timeOff.map((o) => o.id)).toContain(off.body.timeOff.id));
    await officeB.agent.post(`/api/dispatch/visits/${s.visitId}/assign`).set(XSRF, officeB.csrf).send({ technicianId: null }).expect(200);
    await seen((v, board) => {
      expect(v?.status).toBe('requested');
      expect(board.unassigned.map((x) => x.id)).toContain(s.visitId);
    });
    await officeA.agent.delete(`/api/dispatch/time-off/${off.body.timeOff.id}`).set(XSRF, officeA.csrf).expect(204);

    // A new home in a new area appears among the areas to filter by.
    const other = await scene({ queued: true, hour: 16 });
    await seen((_v, board) => expect(board.areas).toContain(other.area));
  });

  it('turns the flags that follow the clock when their moment passes, with nothing written', async () => {
    // A staff session ends after a while idle, so each moment signs in anew; the kept board is the process's.
    const at = async (iso: string | number, area: string, id: string) => {
      now = new Date(iso);
      return onBoard(await boardOf(await signInStaff(a, OFFICE), area), id)!;
    };
    now = new Date('2032-03-08T15:00:00Z');
    const s = await scene({ hour: 18 }); // window 18:00–20:00 UTC on the 9th
    const before = await at('2032-03-08T15:00:00Z', s.area, s.visitId);
    expect(before.canChange).toBe(true);
    expect(before.windowMissed).toBe(false);
    const cutoffHours = Number((await a.database.db.select({ h: t.company.cancelCutoffHours }).from(t.company))[0]!.h);
    const kept = await version();

    const closed = await at(Date.parse(`${DAY}T18:00:00Z`) - cutoffHours * 3_600_000 + 1_000, s.area, s.visitId); // just past the change cut-off
    expect(closed.canChange).toBe(false);
    expect(closed.windowMissed).toBe(false);
    expect((await at(`${DAY}T20:00:00Z`, s.area, s.visitId)).windowMissed, "the window's end").toBe(true);

    // A clock set back (a test, a corrected server) never reads a board built for a later moment.
    expect((await at('2032-03-08T15:00:00Z', s.area, s.visitId)).canChange).toBe(true);
    expect(await version(), 'nothing on the board was written').toBe(kept);
  });

  it('is compressed once for the browsers that take gzip, and plain for a client that asks for none', async () => {
    const s = await scene({ hour: 15 });
    const ask = (encoding: string) => officeA.agent.get('/api/dispatch/board').query({ from: DAY, days: 1, area: s.area }).set('Accept-Encoding', encoding).expect(200);
    const zipped = await ask('gzip, deflate, br');
    const plain = await ask('identity');
    expect(zipped.headers['content-encoding']).toBe('gzip');
    expect(zipped.headers['vary']).toMatch(/Accept-Encoding/i);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.headers['content-type']).toMatch(/^application\/json/);
    expect(zipped.body).toEqual(plain.body);
    expect(onBoard(plain.body as Board, s.visitId)).toBeDefined();
  });

  it('is bumped once per transaction that changes the board, at its commit, and not by writes it does not show', async () => {
    const s = await scene({ hour: 21 });
    const db = a.database.db;
    let v = await version();
    await db.transaction(async (tx) => {
      await tx
        .update(t.customers)
        .set({ name: `Once ${s.tag}` })
        .where(eq(t.customers.id, s.customerId));
      await tx.update(t.visits).set({ notes: 'one' }).where(eq(t.visits.id, s.visitId));
      await tx.update(t.visits).set({ notes: 'two' }).where(eq(t.visits.id, s.visitId));
      await tx.execute(sql`select 1`);
    });
    expect(await version()).toBe(v + 1);
    v = await version();
    await db
      .transaction(async (tx) => {
        await tx
          .update(t.customers)
          .set({ name: `Rolled back ${s.tag}` })
          .where(eq(t.customers.id, s.customerId));
        throw new Error('roll back');
      })
      .catch(() => undefined);
    expect(await version(), 'a rolled-back write bumps nothing').toBe(v);
    await db.update(t.visits).set({ reminderSentAt: now }).where(eq(t.visits.id, s.visitId));
    await db.update(t.customers).set({ phone: '+18165550123' }).where(eq(t.customers.id, s.customerId));
    await db.update(t.users).set({ lastSignInAt: now }).where(eq(t.users.email, OFFICE));
    expect(await version(), 'a reminder sent, a phone number and a sign-in are not on the board').toBe(v);
  });
});
