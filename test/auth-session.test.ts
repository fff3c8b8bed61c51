import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { testApp } from './support/app';
import { anonymous, csrfFrom, signInHomeowner, signInStaff } from './support/auth';

const ctx = testApp();
afterAll(() => ctx.close());

const OWNER = 'rosalind.okafor@bluestem-comfort.test';
const TECH = 'marcus.bellweather@bluestem-comfort.test';
const DANA = 'dana.whitfield@example.test';

describe('session and staff sign-in', () => {
  it('GET /api/session answers no user and issues a CSRF cookie readable by scripts', async () => {
    const res = await request(ctx.app).get('/api/session').expect(200);
    expect(res.body.user).toBeNull();
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('XSRF-TOKEN='));
    expect(cookie).toBeDefined();
    expect(cookie).not.toMatch(/HttpOnly/i); // Angular HttpClient must read it (Angular security guide)
  });

  it("GET /api/session names the company's time zone and country, in which every screen writes dates and phone numbers", async () => {
    const res = await request(ctx.app).get('/api/session').expect(200);
    // The demo company is in Larkspur Bend, Missouri: US Central time (IANA "America/Chicago").
    expect(res.body.company).toEqual({ timeZone: 'America/Chicago', country: 'US' });
  });

  it('signs staff in, returns the user, and the session sticks', async () => {
    const { agent } = await signInStaff(ctx, OWNER);
    const res = await agent.get('/api/session').expect(200);
    expect(res.body.user).toMatchObject({ email: OWNER, role: 'owner', customerId: null });
  });

  it('sends the session cookie again after a minute of use, so its expiry follows the idle clock, and not with every answer', async () => {
    let now = Date.parse('2031-03-03T15:00:00Z');
    const timed = testApp({ clock: () => new Date(now) });
    try {
      const { agent } = await signInStaff(timed, OWNER);
      const sid = (res: { headers: Record<string, unknown> }) => ((res.headers['set-cookie'] as string[] | undefined) ?? []).find((c) => c.startsWith('sw.sid='));
      now += 10_000;
      const soon = await agent.get('/api/session').expect(200);
      expect(soon.body.user).toMatchObject({ email: OWNER });
      expect(sid(soon), 'nothing to save within the minute').toBeUndefined();
      now += 60_000;
      const later = await agent.get('/api/session').expect(200);
      expect(sid(later)).toMatch(/Expires=/);
      // The staff idle limit (30 minutes) counts from that request, not from signing in.
      now += 29 * 60_000;
      expect((await agent.get('/api/session').expect(200)).body.user).toMatchObject({ email: OWNER });
    } finally {
      await timed.close();
    }
  });

  it('rejects a wrong password with 401 and a field error', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const res = await agent.post('/api/auth/staff/sign-in').set('X-XSRF-TOKEN', csrf).send({ email: TECH, password: 'not-the-right-one-2026' });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('bad_credentials');
    expect(res.body.error.fields.password).toMatch(/do not match/);
  });

  it('names the field when the e-mail is malformed', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const res = await agent.post('/api/auth/staff/sign-in').set('X-XSRF-TOKEN', csrf).send({ email: 'nope', password: 'x' });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.email).toMatch(/valid e-mail/);
  });

  it('signs a homeowner in through a link and signs out', async () => {
    const { agent, csrf } = await signInHomeowner(ctx, DANA);
    const me = await agent.get('/api/session').expect(200);
    expect(me.body.user).toMatchObject({ email: DANA, role: 'homeowner' });
    expect(me.body.user.customerId).toMatch(/^[0-9a-f-]{36}$/);
    const out = await agent.post('/api/auth/sign-out').set('X-XSRF-TOKEN', csrf).expect(200);
    expect(csrfFrom(out)).toBeDefined();
    expect((await agent.get('/api/session')).body.user).toBeNull();
  });

  it('refuses a write without the CSRF header, and with a foreign Origin', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const missing = await agent.post('/api/auth/staff/sign-in').send({ email: OWNER, password: 'bluestem-demo-staff-2026' });
    expect(missing.status).toBe(403);
    expect(missing.body.error.code).toBe('csrf_failed');
    const foreign = await agent
      .post('/api/auth/staff/sign-in')
      .set('X-XSRF-TOKEN', csrf)
      .set('Origin', 'https://elsewhere.example')
      .send({ email: OWNER, password: 'bluestem-demo-staff-2026' });
    expect(foreign.status).toBe(403);
  });
});
