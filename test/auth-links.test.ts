import { randomUUID } from 'node:crypto';
import jwt from 'jsonwebtoken';
import { afterAll, beforeAll, describe, expect, it, onTestFinished } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { auditEvents, customers, signInLinks, users } from '../server/db/schema';
import { testApp, type TestContext } from './support/app';
import { anonymous, csrfFrom, mailCatcher, tokenOf } from './support/auth';
import { startTestJobs } from './support/jobs';

let mail: Awaited<ReturnType<typeof mailCatcher>>;
let ctx: TestContext;
let queue: Awaited<ReturnType<typeof startTestJobs>>;
let now = Date.now();
const clock = () => new Date(now);

beforeAll(async () => {
  mail = await mailCatcher();
  ctx = testApp({ clock, mailer: mail.mailer });
  // Links go out through the mail queue, as in production.
  queue = await startTestJobs(ctx.deps);
});
afterAll(async () => {
  await queue.stop();
  await mail.close();
  await ctx.close();
});

let ipSeq = 0;
// A fresh documentation-range address per test so per-address limits never mix (RFC 5737).
const nextIp = () => `198.51.100.${(ipSeq++ % 250) + 1}`;

async function newHomeowner(): Promise<string> {
  const tag = randomUUID().slice(0, 8);
  const email = `home-${tag}@example.test`;
  const [c] = await ctx.database.db
    .insert(customers)
    .values({ name: `Test household ${tag}`, email })
    .returning();
  await ctx.database.db.insert(users).values({ email, name: `Test homeowner ${tag}`, role: 'homeowner', customerId: c.id });
  return email;
}

async function requestLink(email: string, ip = nextIp()) {
  const { agent, csrf } = await anonymous(ctx);
  const res = await agent.post('/api/auth/link').set('X-XSRF-TOKEN', csrf).set('X-Forwarded-For', ip).send({ email });
  return res;
}

async function confirm(token: string) {
  const { agent, csrf } = await anonymous(ctx);
  const res = await agent.post('/api/auth/link/confirm').set('X-XSRF-TOKEN', csrf).send({ token });
  return { res, agent };
}

async function linkTokenFor(email: string): Promise<string> {
  const after = new Date(Date.now() - 1);
  expect((await requestLink(email)).status).toBe(202);
  return tokenOf(await mail.linkFor(email, after));
}

describe('homeowner sign-in by e-mailed link', () => {
  it('mails a link to the confirm page that signs the homeowner in once', async () => {
    const email = await newHomeowner();
    const after = new Date(Date.now() - 1);
    const res = await requestLink(email);
    expect(res.status).toBe(202);
    const link = await mail.linkFor(email, after);
    expect(new URL(link).pathname).toBe('/sign-in/confirm');
    const { res: ok, agent } = await confirm(tokenOf(link));
    expect(ok.status).toBe(200);
    expect(ok.body.user).toMatchObject({ email, role: 'homeowner' });
    expect((await agent.get('/api/session')).body.user.email).toBe(email);

    const again = (await confirm(tokenOf(link))).res;
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('link_used');
    expect(again.body.error.message).toMatch(/already been used/);
  });

  it('refuses a link after 10 minutes (clock moved on)', async () => {
    const email = await newHomeowner();
    const token = await linkTokenFor(email);
    const start = now;
    now = start + 10 * 60_000 + 1000;
    try {
      const { res } = await confirm(token);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('link_expired');
      expect(res.body.error.message).toMatch(/expired/);
    } finally {
      now = start;
    }
  });

  it('still accepts the link just inside 10 minutes', async () => {
    const email = await newHomeowner();
    const token = await linkTokenFor(email);
    const start = now;
    now = start + 9 * 60_000;
    try {
      expect((await confirm(token)).res.status).toBe(200);
    } finally {
      now = start;
    }
  });

  it('refuses a tampered token', async () => {
    const email = await newHomeowner();
    const token = await linkTokenFor(email);
    const [h, p, s] = token.split('.');
    const payload = JSON.parse(Buffer.from(p, 'base64url').toString());
    const forged = `${h}.${Buffer.from(JSON.stringify({ ...payload, exp: payload.exp + 3600 })).toString('base64url')}.${s}`;
    const { res } = await confirm(forged);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('link_invalid');
    const flipped = token.slice(0, -2) + (token.endsWith('AA') ? 'BB' : 'AA');
    expect((await confirm(flipped)).res.body.error.code).toBe('link_invalid');
    // The untouched token still works: refusals did not use it up.
    expect((await confirm(token)).res.status).toBe(200);
  });

  it('refuses a link re-addressed to someone else, even with a valid signature', async () => {
    const a = await newHomeowner();
    const b = await newHomeowner();
    const token = await linkTokenFor(a);
    const claims = jwt.decode(token) as jwt.JwtPayload;
    const readdressed = jwt.sign({ ...claims, sub: b }, ctx.deps.config.JWT_SECRET, { algorithm: 'HS256' });
    const { res } = await confirm(readdressed);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('link_wrong_address');
    expect(res.body.error.message).toMatch(/not sent to this address/);
  });

  it('refuses an unsigned token (alg none)', async () => {
    const email = await newHomeowner();
    const token = await linkTokenFor(email);
    const claims = jwt.decode(token) as jwt.JwtPayload;
    const none = `${Buffer.from('{"alg":"none","typ":"JWT"}').toString('base64url')}.${Buffer.from(JSON.stringify(claims)).toString('base64url')}.`;
    expect((await confirm(none)).res.body.error.code).toBe('link_invalid');
  });

  it('lets exactly one of two simultaneous clicks through', async () => {
    for (let round = 0; round < 3; round++) {
      const email = await newHomeowner();
      const token = await linkTokenFor(email);
      const a = await anonymous(ctx);
      const b = await anonymous(ctx);
      const results = await Promise.all([
        a.agent.post('/api/auth/link/confirm').set('X-XSRF-TOKEN', a.csrf).send({ token }),
        b.agent.post('/api/auth/link/confirm').set('X-XSRF-TOKEN', b.csrf).send({ token }),
      ]);
      expect(results.map((r) => r.status).sort()).toEqual([200, 400]);
      expect(results.find((r) => r.status === 400)!.body.error.code).toBe('link_used');
    }
  });

  it('changes the session id at sign-in and sends no referrer from the confirm call', async () => {
    const email = await newHomeowner();
    const token = await linkTokenFor(email);
    const { agent, csrf } = await anonymous(ctx);
    // A refused link leaves the visitor signed out.
    expect(
      (
        await agent
          .post('/api/auth/link/confirm')
          .set('X-XSRF-TOKEN', csrf)
          .send({ token: 'x'.repeat(30) })
      ).status,
    ).toBe(400);
    expect((await agent.get('/api/session')).body.user).toBeNull();
    const first = await anonymous(ctx);
    const initial = cookieValue(first, 'sw.sid');
    const res = await first.agent.post('/api/auth/link/confirm').set('X-XSRF-TOKEN', first.csrf).send({ token });
    expect(res.status).toBe(200);
    expect(res.headers['referrer-policy']).toBe('no-referrer');
    const after = setCookie(res, 'sw.sid');
    expect(initial).toBeTruthy();
    expect(after).toBeTruthy();
    expect(after).not.toBe(initial);
    expect(csrfFrom(res)).not.toBe(first.csrf);
  });

  it('names the field when the address is not an e-mail address', async () => {
    const res = await requestLink('not-an-address');
    expect(res.status).toBe(422);
    expect(res.body.error.fields.email).toMatch(/valid e-mail/);
  });
});

describe('no account enumeration on link requests', () => {
  const comparable = (h: Record<string, unknown>) => {
    const copy: Record<string, unknown> = { ...h };
    // Date and the live counters differ between any two requests; the partition key hashes the address.
    for (const k of ['date', 'ratelimit', 'set-cookie']) delete copy[k];
    copy['ratelimit-policy'] = String(copy['ratelimit-policy']).replace(/pk=:[^:]*:/g, 'pk');
    return copy;
  };

  it('answers a known and an unknown address identically', async () => {
    const known = await newHomeowner();
    const unknown = `nobody-${randomUUID().slice(0, 8)}@example.test`;
    const a = await requestLink(known);
    const b = await requestLink(unknown);
    expect(a.status).toBe(202);
    expect(b.status).toBe(a.status);
    expect(b.body).toEqual(a.body);
    expect(comparable(b.headers)).toEqual(comparable(a.headers));
    expect(Object.keys(b.headers).sort()).toEqual(Object.keys(a.headers).sort());
    // Only the known address leaves a stored link and an audit row.
    const logged = await ctx.database.db
      .select()
      .from(auditEvents)
      .where(inArray(auditEvents.subject, [known, unknown]));
    expect(logged.map((e) => [e.subject, e.action])).toEqual([[known, 'link_requested']]);
    expect(await ctx.database.db.select().from(signInLinks).where(eq(signInLinks.email, unknown))).toEqual([]);
  });

  it('takes about the same time for known and unknown addresses', async () => {
    const knownAddresses = await Promise.all(Array.from({ length: 12 }, () => newHomeowner()));
    // The requests queue their mail as always; no worker sends it meanwhile in this same process,
    // so the figures are the requests' own.
    const idle = await startTestJobs(ctx.deps, { work: false });
    onTestFinished(() => idle.stop());
    const time = async (email: string) => {
      const { agent, csrf } = await anonymous(ctx);
      const t0 = performance.now();
      const res = await agent.post('/api/auth/link').set('X-XSRF-TOKEN', csrf).set('X-Forwarded-For', nextIp()).send({ email });
      const ms = performance.now() - t0;
      expect(res.status).toBe(202);
      return ms;
    };
    const k: number[] = [];
    const u: number[] = [];
    for (let i = 0; i < knownAddresses.length; i++) {
      k.push(await time(knownAddresses[i]));
      u.push(await time(`ghost-${i}-${randomUUID().slice(0, 6)}@example.test`));
    }
    const median = (xs: number[]) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)];
    // Each known address is timed right beside an unknown one, so a busy machine slows both of a
    // pair alike; the median of the pairs' differences is what the address itself costs.
    const gap = Math.abs(median(k.map((ms, i) => ms - u[i])));
    // A gap of a database insert (a few ms) is tolerated; a mail round trip or a hash would not be.
    expect(gap).toBeLessThan(Math.max(20, 0.5 * Math.min(median(k), median(u))));
  });
});

describe('rate limits on link requests', () => {
  it('answers 429 in the usual error shape after 5 requests for one address', async () => {
    const email = await newHomeowner();
    const codes: number[] = [];
    for (let i = 0; i < 6; i++) codes.push((await requestLink(email)).status);
    expect(codes.slice(0, 5)).toEqual([202, 202, 202, 202, 202]);
    const res = await requestLink(email);
    expect(res.status).toBe(429);
    expect(res.body.error.code).toBe('rate_limited');
    expect(res.body.error.message).toMatch(/wait/);
  });

  it('answers 429 after 30 requests from one network address', async () => {
    const ip = '203.0.113.77';
    let last = 0;
    for (let i = 0; i < 31; i++) last = (await requestLink(`spray-${i}-${randomUUID().slice(0, 6)}@example.test`, ip)).status;
    expect(last).toBe(429);
  });
});

function setCookie(res: { headers: Record<string, unknown> }, name: string): string | undefined {
  const raw = (res.headers['set-cookie'] as string[] | undefined) ?? [];
  const hit = raw.find((c) => c.startsWith(`${name}=`));
  return hit?.split(';')[0].slice(name.length + 1);
}

function cookieValue(signed: { agent: { jar: { getCookie(name: string, access: unknown): { value: string } | undefined } } }, name: string): string | undefined {
  return signed.agent.jar.getCookie(name, { domain: '127.0.0.1', path: '/', secure: false, script: false })?.value;
}
