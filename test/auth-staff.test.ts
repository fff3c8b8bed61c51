import { randomUUID } from 'node:crypto';
import { hash } from '@node-rs/argon2';
import { eq } from 'drizzle-orm';
import express from 'express';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { authMiddleware } from '../server/auth/session';
import { auditEvents, technicians, users } from '../server/db/schema';
import { productionEnv, testApp, type TestContext } from './support/app';
import { anonymous, csrfFrom, mailCatcher, signInHomeowner, signInStaff, tokenOf } from './support/auth';

const OWNER = 'rosalind.okafor@bluestem-comfort.test';
const OFFICE = 'teo.marchetti@bluestem-comfort.test';
const PASSWORD = 'kettle-orchard-lantern-9';

let mail: Awaited<ReturnType<typeof mailCatcher>>;
let ctx: TestContext;
let now = Date.now();
const clock = () => new Date(now);

beforeAll(async () => {
  mail = await mailCatcher();
  ctx = testApp({ clock, mailer: mail.mailer });
});
afterAll(async () => {
  await mail.close();
  await ctx.close();
});

let ipSeq = 0;
const nextIp = () => `192.0.2.${(ipSeq++ % 250) + 1}`; // RFC 5737 documentation range

async function newStaff(role: 'technician' | 'office' = 'office'): Promise<{ id: string; email: string }> {
  const email = `staff-${randomUUID().slice(0, 8)}@bluestem-comfort.test`;
  const [u] = await ctx.database.db
    .insert(users)
    .values({ email, name: 'Test Staff', role, passwordHash: await hash(PASSWORD) })
    .returning();
  return { id: u.id, email };
}

async function attempt(email: string, password: string, ip: string) {
  const { agent, csrf } = await anonymous(ctx);
  return agent.post('/api/auth/staff/sign-in').set('X-XSRF-TOKEN', csrf).set('X-Forwarded-For', ip).send({ email, password });
}

describe('session cookie', () => {
  it('is HttpOnly and SameSite=Lax, named sw.sid outside production, and changes at sign-in', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const first = agent.jar.getCookie('sw.sid', { domain: '127.0.0.1', path: '/', secure: false, script: false })?.value;
    const res = await agent.post('/api/auth/staff/sign-in').set('X-XSRF-TOKEN', csrf).send({ email: OFFICE, password: 'bluestem-demo-staff-2026' });
    expect(res.status).toBe(200);
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('sw.sid='))!;
    expect(cookie).toMatch(/HttpOnly/); // OWASP Session Management Cheat Sheet
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).toMatch(/Path=\//);
    expect(first).toBeTruthy();
    expect(cookie.split(';')[0].slice('sw.sid='.length)).not.toBe(first);
  });

  it('in production is __Host-sw.sid, Secure, no Domain, over HTTPS behind the proxy', async () => {
    const prod = testApp({ env: productionEnv() });
    try {
      const agent = request.agent(prod.app);
      const s = await agent.get('/api/session').set('X-Forwarded-Proto', 'https').expect(200);
      const csrf = csrfFrom(s)!;
      expect((s.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('XSRF-TOKEN='))).toMatch(/Secure/);
      const res = await request(prod.app)
        .post('/api/auth/staff/sign-in')
        .set('X-Forwarded-Proto', 'https')
        .set('Cookie', (s.headers['set-cookie'] as unknown as string[]).map((c) => c.split(';')[0]).join('; '))
        .set('X-XSRF-TOKEN', csrf)
        .send({ email: OFFICE, password: 'bluestem-demo-staff-2026' });
      expect(res.status).toBe(200);
      const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('__Host-sw.sid='))!;
      // __Host- prefix rules: Secure, Path=/, no Domain (RFC 6265bis section 4.1.3.2)
      expect(cookie).toMatch(/; Secure/);
      expect(cookie).toMatch(/Path=\//);
      expect(cookie).not.toMatch(/Domain=/i);
      expect(cookie).toMatch(/HttpOnly/);
      expect(cookie).toMatch(/SameSite=Lax/);
      // Over plain HTTP no secure cookie is handed out at all.
      const plain = await request(prod.app).get('/api/session');
      expect(((plain.headers['set-cookie'] as unknown as string[]) ?? []).some((c) => c.startsWith('__Host-sw.sid='))).toBe(false);
    } finally {
      await prod.close();
    }
  });
});

describe('CSRF', () => {
  it('refuses a missing, a wrong and another session’s token with 403, and a foreign Origin', async () => {
    const a = await anonymous(ctx);
    const b = await anonymous(ctx);
    const body = { email: 'x@example.test' };
    expect((await a.agent.post('/api/auth/link').send(body)).status).toBe(403);
    expect((await a.agent.post('/api/auth/link').set('X-XSRF-TOKEN', 'abc.def').send(body)).status).toBe(403);
    // b's token is genuine but bound to b's session; a's cookie differs too.
    expect((await a.agent.post('/api/auth/link').set('X-XSRF-TOKEN', b.csrf).send(body)).status).toBe(403);
    const foreign = await a.agent.post('/api/auth/link').set('X-XSRF-TOKEN', a.csrf).set('Origin', 'https://attacker.example').send(body);
    expect(foreign.status).toBe(403);
    expect(foreign.body.error.code).toBe('csrf_failed');
    const own = await a.agent.post('/api/auth/link').set('X-XSRF-TOKEN', a.csrf).set('Origin', ctx.deps.config.publicUrl).set('X-Forwarded-For', nextIp()).send(body);
    expect(own.status).toBe(202);
  });

  it('refuses a token whose cookie was replaced (double submit must match)', async () => {
    const a = await anonymous(ctx);
    const res = await request(ctx.app).post('/api/auth/link').set('X-XSRF-TOKEN', a.csrf).set('Cookie', 'XSRF-TOKEN=other.value').send({ email: 'x@example.test' });
    expect(res.status).toBe(403);
  });

  it('lets raw-body webhook paths through without a token, and nothing else', async () => {
    const app = express();
    app.use(authMiddleware(ctx.deps, ['/api/hooks/cards']));
    app.post('/api/hooks/cards', (_req, res) => res.json({ ok: true }));
    app.post('/api/other', (_req, res) => res.json({ ok: true }));
    app.use(((err, _req, res, _next) => res.status(err.status ?? 500).json({ code: err.code })) as express.ErrorRequestHandler);
    expect((await request(app).post('/api/hooks/cards')).status).toBe(200);
    expect((await request(app).post('/api/other')).status).toBe(403);
  });
});

describe('password attempts', () => {
  it('slows down after 5 failures, locks after 10, and unlocks after 15 minutes', async () => {
    const s = await newStaff();
    const ip = nextIp();
    const start = now;
    try {
      for (let i = 0; i < 5; i++) expect((await attempt(s.email, 'wrong-password-123', ip)).status).toBe(401);
      const slowed = await attempt(s.email, PASSWORD, ip);
      expect(slowed.status).toBe(429);
      expect(slowed.body.error.message).toMatch(/wait 1 second and/);
      // Failures 6–10, each after the growing wait (1, 2, 4, 8, 16 s).
      for (const wait of [1, 2, 4, 8, 16]) {
        now += wait * 1000;
        expect((await attempt(s.email, 'wrong-password-123', ip)).status).toBe(401);
      }
      now += 60_000;
      const locked = await attempt(s.email, PASSWORD, ip);
      expect(locked.status).toBe(429);
      expect(locked.body.error.code).toBe('too_many_attempts');
      expect(locked.body.error.message).toMatch(/minutes/);
      now += 15 * 60_000;
      expect((await attempt(s.email, PASSWORD, ip)).status).toBe(200);
      const actions = await ctx.database.db.select({ action: auditEvents.action }).from(auditEvents).where(eq(auditEvents.subject, s.email));
      expect(actions.filter((a) => a.action === 'sign_in_failed').length).toBe(9);
      expect(actions.some((a) => a.action === 'sign_in_locked')).toBe(true);
      expect(actions.some((a) => a.action === 'sign_in')).toBe(true);
    } finally {
      now = start;
    }
  });

  it('counts unknown addresses the same way, so locking does not reveal who has an account', async () => {
    const ip = nextIp();
    const ghost = `ghost-${randomUUID().slice(0, 6)}@bluestem-comfort.test`;
    for (let i = 0; i < 5; i++) expect((await attempt(ghost, 'wrong-password-123', ip)).status).toBe(401);
    expect((await attempt(ghost, 'wrong-password-123', ip)).status).toBe(429);
  });

  it('answers 429 from the network limiter after 40 refused attempts from one address', async () => {
    const ip = '203.0.113.200';
    const start = now;
    try {
      let last = 0;
      for (let i = 0; i < 41; i++) {
        const s = `spray-${i}-${randomUUID().slice(0, 4)}@bluestem-comfort.test`;
        last = (await attempt(s, 'wrong-password-123', ip)).status;
      }
      expect(last).toBe(429);
    } finally {
      now = start;
    }
  }, 60_000);
});

describe('session timeouts on the injected clock', () => {
  it('ends a staff session after 30 idle minutes', async () => {
    const s = await newStaff();
    const { agent } = await signInStaff(ctx, s.email, PASSWORD);
    const start = now;
    try {
      now += 29 * 60_000;
      expect((await agent.get('/api/session')).body.user?.email).toBe(s.email);
      now += 29 * 60_000; // idle time counts from the last request
      expect((await agent.get('/api/session')).body.user?.email).toBe(s.email);
      now += 31 * 60_000;
      expect((await agent.get('/api/session')).body.user).toBeNull();
    } finally {
      now = start;
    }
  });

  it('ends a busy staff session 12 hours after sign-in', async () => {
    const s = await newStaff();
    const { agent } = await signInStaff(ctx, s.email, PASSWORD);
    const start = now;
    try {
      // Active every 20 minutes up to 11 h 40 min, then at 11 h 59 min: never idle for long.
      for (let i = 0; i < 35; i++) {
        now += 20 * 60_000;
        expect((await agent.get('/api/session')).body.user?.email).toBe(s.email);
      }
      now += 19 * 60_000;
      expect((await agent.get('/api/session')).body.user?.email).toBe(s.email);
      now += 2 * 60_000; // 12 h 1 min after sign-in, 2 minutes after the last request
      expect((await agent.get('/api/session')).body.user).toBeNull();
    } finally {
      now = start;
    }
  });

  it('keeps a homeowner signed in for 13 idle days and ends it after 14', async () => {
    const home = await signInHomeowner(ctx, 'sam.oduya@example.test');
    const start = now;
    try {
      now += 13 * 24 * 3600_000;
      expect((await home.agent.get('/api/session')).body.user?.email).toBe('sam.oduya@example.test');
      now += 14 * 24 * 3600_000 + 60_000;
      expect((await home.agent.get('/api/session')).body.user).toBeNull();
    } finally {
      now = start;
    }
  });

  it('answers a write from a timed-out session with 401, not a token error', async () => {
    const s = await newStaff();
    const { agent, csrf } = await signInStaff(ctx, s.email, PASSWORD);
    const start = now;
    try {
      now += 31 * 60_000;
      const res = await agent.post('/api/auth/sign-out').set('X-XSRF-TOKEN', csrf);
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('session_ended');
    } finally {
      now = start;
    }
  });
});

describe('sign out everywhere and disabling', () => {
  it('ends every session of the user', async () => {
    const s = await newStaff();
    const one = await signInStaff(ctx, s.email, PASSWORD);
    const two = await signInStaff(ctx, s.email, PASSWORD);
    const res = await one.agent.post('/api/auth/sign-out-everywhere').set('X-XSRF-TOKEN', one.csrf);
    expect(res.status).toBe(200);
    expect(res.body.sessionsEnded).toBeGreaterThanOrEqual(2);
    expect((await two.agent.get('/api/session')).body.user).toBeNull();
    expect((await one.agent.get('/api/session')).body.user).toBeNull();
  });

  it('disabling ends sessions and blocks sign-in; enabling lets them back', async () => {
    const s = await newStaff('technician');
    const victim = await signInStaff(ctx, s.email, PASSWORD);
    const owner = await signInStaff(ctx, OWNER);
    const off = await owner.agent.patch(`/api/auth/staff/${s.id}`).set('X-XSRF-TOKEN', owner.csrf).send({ disabled: true });
    expect(off.status).toBe(200);
    expect(off.body.disabled).toBe(true);
    expect((await victim.agent.get('/api/session')).body.user).toBeNull();
    const blocked = await attempt(s.email, PASSWORD, nextIp());
    expect(blocked.status).toBe(403);
    expect(blocked.body.error.code).toBe('account_disabled');
    await owner.agent.patch(`/api/auth/staff/${s.id}`).set('X-XSRF-TOKEN', owner.csrf).send({ disabled: false }).expect(200);
    expect((await attempt(s.email, PASSWORD, nextIp())).status).toBe(200);
  });

  it('the owner can end a staff member’s sessions and change their role', async () => {
    const s = await newStaff('office');
    const victim = await signInStaff(ctx, s.email, PASSWORD);
    const owner = await signInStaff(ctx, OWNER);
    const role = await owner.agent.patch(`/api/auth/staff/${s.id}`).set('X-XSRF-TOKEN', owner.csrf).send({ role: 'technician' });
    expect(role.body.role).toBe('technician');
    expect((await victim.agent.get('/api/session')).body.user.role).toBe('technician');
    const [tech] = await ctx.database.db.select().from(technicians).where(eq(technicians.userId, s.id));
    expect(tech.active).toBe(true);
    const res = await owner.agent.post(`/api/auth/staff/${s.id}/sign-out-everywhere`).set('X-XSRF-TOKEN', owner.csrf);
    expect(res.body.sessionsEnded).toBe(1);
    expect((await victim.agent.get('/api/session')).body.user).toBeNull();
  });

  it('names the problem when a staff change is empty', async () => {
    const owner = await signInStaff(ctx, OWNER);
    const s = await newStaff();
    const res = await owner.agent.patch(`/api/auth/staff/${s.id}`).set('X-XSRF-TOKEN', owner.csrf).send({ disabled: 'yes' });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.disabled).toBeDefined();
  });
});

describe('staff invitations and passwords', () => {
  it('the owner invites a technician; the e-mailed link sets a password that passes the policy', async () => {
    const owner = await signInStaff(ctx, OWNER);
    const email = `new-tech-${randomUUID().slice(0, 6)}@bluestem-comfort.test`;
    const after = new Date(Date.now() - 1);
    const inv = await owner.agent.post('/api/auth/staff/invite').set('X-XSRF-TOKEN', owner.csrf).send({ email, name: 'Wren Ashgrove', role: 'technician' });
    expect(inv.status).toBe(201);
    const [tech] = await ctx.database.db.select().from(technicians).where(eq(technicians.userId, inv.body.userId));
    expect(Object.keys(tech.weeklyHours).sort()).toEqual(['1', '2', '3', '4', '5']);
    const link = await mail.linkFor(email, after);
    expect(new URL(link).pathname).toBe('/set-password');
    const token = tokenOf(link);
    const { agent, csrf } = await anonymous(ctx);
    for (const weak of ['password1234', 'qwertyuiop12']) {
      const res = await agent.post('/api/auth/password/set').set('X-XSRF-TOKEN', csrf).send({ token, password: weak });
      expect(res.status).toBe(422);
      expect(res.body.error.fields.password).toMatch(/too common/);
    }
    const short = await agent.post('/api/auth/password/set').set('X-XSRF-TOKEN', csrf).send({ token, password: 'short' });
    expect(short.body.error.fields.password).toMatch(/at least 12/);
    const ok = await agent.post('/api/auth/password/set').set('X-XSRF-TOKEN', csrf).send({ token, password: 'harbor kettle lantern' });
    expect(ok.status).toBe(200);
    expect(ok.body.user).toMatchObject({ email, role: 'technician' });
    expect((await attempt(email, 'harbor kettle lantern', nextIp())).status).toBe(200);
    const dup = await owner.agent.post('/api/auth/staff/invite').set('X-XSRF-TOKEN', owner.csrf).send({ email, name: 'Again', role: 'office' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.email).toBeDefined();
  });

  it('forgot password answers known and unknown addresses alike and mails only the known one', async () => {
    const s = await newStaff();
    const unknown = `nobody-${randomUUID().slice(0, 6)}@bluestem-comfort.test`;
    const after = new Date(Date.now() - 1);
    const a = await anonymous(ctx);
    const known = await a.agent.post('/api/auth/password/forgot').set('X-XSRF-TOKEN', a.csrf).set('X-Forwarded-For', nextIp()).send({ email: s.email });
    const other = await a.agent.post('/api/auth/password/forgot').set('X-XSRF-TOKEN', a.csrf).set('X-Forwarded-For', nextIp()).send({ email: unknown });
    expect(known.status).toBe(202);
    expect(other.status).toBe(202);
    expect(other.body).toEqual(known.body);
    const link = await mail.linkFor(s.email, after);
    expect(await mail.catcher.store.waitForLatest({ to: unknown, after }, 300)).toBeUndefined();
    const old = await signInStaff(ctx, s.email, PASSWORD);
    const res = await a.agent
      .post('/api/auth/password/set')
      .set('X-XSRF-TOKEN', a.csrf)
      .send({ token: tokenOf(link), password: 'new harbor kettle 77' });
    expect(res.status).toBe(200);
    // A new password ends the sessions that used the old one.
    expect((await old.agent.get('/api/session')).body.user).toBeNull();
    expect((await attempt(s.email, PASSWORD, nextIp())).status).toBe(401);
  });

  it('office invites a household; the link signs the homeowner into that household', async () => {
    const office = await signInStaff(ctx, OFFICE);
    const [c] = await ctx.database.db
      .execute<{ id: string }>(
        // A household with no portal sign-in yet.
        (await import('drizzle-orm')).sql`insert into customers (name, email) values ('Invite test household', ${`inv-${randomUUID().slice(0, 6)}@example.test`}) returning id`,
      )
      .then((r) => r.rows);
    const after = new Date(Date.now() - 1);
    const res = await office.agent.post('/api/auth/household-invitations').set('X-XSRF-TOKEN', office.csrf).send({ customerId: c.id });
    expect(res.status).toBe(201);
    const link = await mail.linkFor(res.body.email, after);
    const { agent, csrf } = await anonymous(ctx);
    const ok = await agent
      .post('/api/auth/link/confirm')
      .set('X-XSRF-TOKEN', csrf)
      .send({ token: tokenOf(link) });
    expect(ok.status).toBe(200);
    expect(ok.body.user).toMatchObject({ role: 'homeowner', customerId: c.id });
    const missing = await office.agent.post('/api/auth/household-invitations').set('X-XSRF-TOKEN', office.csrf).send({});
    expect(missing.status).toBe(422);
    expect(missing.body.error.fields.email).toBeDefined();
  });
});

describe('audit log', () => {
  it('shows the owner sign-ins newest first, paged on the server; office gets 403', async () => {
    const owner = await signInStaff(ctx, OWNER);
    const page = await owner.agent.get('/api/audit?page=0&pageSize=5&action=sign_in');
    expect(page.status).toBe(200);
    expect(page.body.items).toHaveLength(5);
    expect(page.body.total).toBeGreaterThanOrEqual(5);
    const times = page.body.items.map((e: { at: string }) => e.at);
    expect([...times].sort().reverse()).toEqual(times);
    expect(page.body.items.every((e: { action: string }) => e.action === 'sign_in')).toBe(true);
    const bad = await owner.agent.get('/api/audit?pageSize=500');
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.pageSize).toBeDefined();
    const office = await signInStaff(ctx, OFFICE);
    expect((await office.agent.get('/api/audit')).status).toBe(403);
  });
});
