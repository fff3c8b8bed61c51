import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { eq, like, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as t from '../server/db/schema';
import { testApp, type TestContext } from './support/app';
import { anonymous, CSRF_HEADER_NAME, signInHomeowner, signInStaff, type Signed } from './support/auth';

// Requests written the way an attacker or a broken client writes them: every one must end in a
// 4xx in the one error shape { error: { code, message, fields? } }, never a 500.

const OWNER = 'rosalind.okafor@bluestem-comfort.test';
const OFFICE = 'teo.marchetti@bluestem-comfort.test';
const DANA = 'dana.whitfield@example.test';

let ctx: TestContext;
let office: Signed;
let dana: Signed;
let danaPropertyId: string;
let danaCustomerId: string;

beforeAll(async () => {
  ctx = testApp();
  office = await signInStaff(ctx, OFFICE);
  dana = await signInHomeowner(ctx, DANA);
  const [row] = await ctx.database.db
    .select({ propertyId: t.properties.id, customerId: t.users.customerId })
    .from(t.users)
    .innerJoin(t.properties, eq(t.properties.customerId, t.users.customerId))
    .where(eq(t.users.email, DANA))
    .limit(1);
  danaPropertyId = row!.propertyId;
  danaCustomerId = row!.customerId!;
});
afterAll(() => ctx.close());

/** The one error shape, with the status and code expected. */
function expectError(res: request.Response, status: number, code?: string) {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  expect(res.type).toBe('application/json');
  expect(res.body).toEqual({ error: expect.objectContaining({ code: expect.any(String), message: expect.any(String) }) });
  expect(Object.keys(res.body.error).every((k) => ['code', 'message', 'fields'].includes(k))).toBe(true);
  if (code) expect(res.body.error.code).toBe(code);
}

const countRows = async (table: string) => Number((await ctx.database.db.execute(sql`select count(*)::int as n from ${sql.identifier(table)}`)).rows[0]!.n);
const rateKeys = async (fragment: string) =>
  (
    await ctx.database.db
      .select({ key: t.rateLimitHits.key })
      .from(t.rateLimitHits)
      .where(like(t.rateLimitHits.key, `%${fragment}%`))
  ).length;

describe('CSRF on every spelling of a path', () => {
  const spellings = [
    '/API/invoices',
    '/api/Invoices/',
    '/%61pi/invoices',
    '/Api/customers',
    '/api/Customers',
    '/api/customers/',
    '/%61pi/customers',
    '/api/%63ustomers',
    '/api//customers',
    '/API/webhooks/stripe-not',
    '/api/Webhooks/stripe',
  ];

  it.each(spellings)('refuses POST %s without the token, before anything is written', async (path) => {
    const before = await countRows('customers');
    const res = await office.agent.post(path).send({ name: 'Spelled household', email: 'spelled@example.test' });
    expectError(res, 403, 'csrf_failed');
    expect(await countRows('customers')).toBe(before);
  });

  it.each(['put', 'patch', 'delete'] as const)('refuses %s on another spelling without the token', async (method) => {
    expectError(await office.agent[method]('/API/settings/company').send({ name: 'Spelled' }), 403, 'csrf_failed');
  });

  it('still signs nobody out through an upper-case path', async () => {
    const s = await signInStaff(ctx, OFFICE);
    expectError(await s.agent.post('/API/auth/sign-out').send({}), 403, 'csrf_failed');
    expect((await s.agent.get('/api/session').expect(200)).body.user).not.toBeNull();
  });

  it('routes case-sensitively and strictly: other spellings are a 404 even with the token', async () => {
    expectError(await office.agent.get('/API/customers'), 404, 'not_found');
    expectError(await office.agent.get('/api/Customers'), 404, 'not_found');
    expectError(await office.agent.get('/api/dispatch/board/').query({ from: '2026-03-02' }), 404, 'not_found');
    expectError(await office.agent.post('/API/customers').set(CSRF_HEADER_NAME, office.csrf).send({ name: 'x' }), 404, 'not_found');
  });

  it('builds every API router case-sensitive and strict', async () => {
    const { apiRouters } = await import('../server/routes');
    for (const r of apiRouters) {
      const router = r.build(ctx.deps) as unknown as { caseSensitive?: boolean; strict?: boolean };
      expect(router.caseSensitive, r.path).toBe(true);
      expect(router.strict, r.path).toBe(true);
    }
  });
});

describe('requests from another site', () => {
  it('refuses a foreign Origin before any handler runs, even with a valid token', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const email = `foreign-origin-${Date.now()}@example.test`;
    const res = await agent.post('/api/auth/link').set(CSRF_HEADER_NAME, csrf).set('Origin', 'https://elsewhere.example').send({ email });
    expectError(res, 403, 'csrf_failed');
    expect(await rateKeys(email)).toBe(0); // the rate limiter never saw it
  });

  it('refuses Origin: null (a sandboxed frame or a data: page)', async () => {
    expectError(await office.agent.post('/api/customers').set(CSRF_HEADER_NAME, office.csrf).set('Origin', 'null').send({ name: 'x' }), 403, 'csrf_failed');
  });

  it('refuses Sec-Fetch-Site: cross-site when the browser sends no Origin', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const email = `cross-site-${Date.now()}@example.test`;
    const res = await agent.post('/api/auth/link').set(CSRF_HEADER_NAME, csrf).set('Sec-Fetch-Site', 'cross-site').send({ email });
    expectError(res, 403, 'csrf_failed');
    expect(await rateKeys(email)).toBe(0);
  });

  it('lets our own origin and same-origin fetches through', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const res = await agent
      .post('/api/auth/link')
      .set(CSRF_HEADER_NAME, csrf)
      .set('Origin', ctx.deps.config.publicUrl)
      .set('Sec-Fetch-Site', 'same-origin')
      .send({ email: `own-origin-${Date.now()}@example.test` });
    expect(res.status).toBe(202);
  });

  it('does not refuse reads from another site (links and images)', async () => {
    await request(ctx.app).get('/api/health').set('Sec-Fetch-Site', 'cross-site').set('Origin', 'https://elsewhere.example').expect(200);
  });
});

describe('JSON only', () => {
  it('answers a form-encoded body with 415 and signs nobody in', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const res = await agent.post('/api/auth/staff/sign-in').set(CSRF_HEADER_NAME, csrf).type('form').send({ email: OWNER, password: 'bluestem-demo-staff-2026' });
    expectError(res, 415, 'unsupported_media_type');
    expect((await agent.get('/api/session')).body.user).toBeNull();
  });

  it('answers text/plain and multipart on a JSON route with 415', async () => {
    expectError(await office.agent.post('/api/customers').set(CSRF_HEADER_NAME, office.csrf).set('Content-Type', 'text/plain').send('{"name":"x"}'), 415, 'unsupported_media_type');
    expectError(await office.agent.post('/api/customers').set(CSRF_HEADER_NAME, office.csrf).field('name', 'x'), 415, 'unsupported_media_type');
  });

  it('still takes bodiless writes and JSON with a charset', async () => {
    const s = await signInStaff(ctx, OFFICE);
    await s.agent.post('/api/auth/sign-out').set(CSRF_HEADER_NAME, s.csrf).expect(200);
    const res = await office.agent.get('/api/customers').set('Content-Type', 'application/json; charset=utf-8');
    expect(res.status).toBe(200);
  });

  it('keeps multipart for uploads', async () => {
    const res = await dana.agent.post('/api/files').set(CSRF_HEADER_NAME, dana.csrf).field('propertyId', danaPropertyId).field('category', 'problem');
    expect(res.status).not.toBe(415);
    expect(res.status).toBeLessThan(500);
  });
});

describe('errors from parsing and decoding keep their status', () => {
  it('malformed JSON is 400', async () => {
    const res = await office.agent.post('/api/customers').set(CSRF_HEADER_NAME, office.csrf).set('Content-Type', 'application/json').send('{"name":');
    expectError(res, 400, 'bad_json');
  });

  it('a body over the limit is 413', async () => {
    const res = await office.agent
      .post('/api/customers')
      .set(CSRF_HEADER_NAME, office.csrf)
      .set('Content-Type', 'application/json')
      .send(JSON.stringify({ name: 'x'.repeat(1_100_000) }));
    expectError(res, 413, 'too_large');
  });

  it('an unknown Content-Encoding is 415', async () => {
    const res = await office.agent
      .post('/api/customers')
      .set(CSRF_HEADER_NAME, office.csrf)
      .set('Content-Type', 'application/json')
      .set('Content-Encoding', 'compress')
      .send('{"name":"x"}');
    expectError(res, 415);
  });

  it('a gzip body that is not gzip is 400', async () => {
    const res = await office.agent
      .post('/api/customers')
      .set(CSRF_HEADER_NAME, office.csrf)
      .set('Content-Type', 'application/json')
      .set('Content-Encoding', 'gzip')
      .send('{"name":"x"}');
    expectError(res, 400);
  });

  it('a real gzip JSON body is read', async () => {
    const res = await office.agent
      .post('/api/customers')
      .set(CSRF_HEADER_NAME, office.csrf)
      .set('Content-Type', 'application/json')
      .set('Content-Encoding', 'gzip')
      .serialize((b) => b)
      .send(gzipSync(JSON.stringify({ name: '' })));
    expectError(res, 422, 'validation_failed');
  });

  it('a charset other than UTF-8 is 415', async () => {
    const res = await office.agent.post('/api/customers').set(CSRF_HEADER_NAME, office.csrf).set('Content-Type', 'application/json; charset=latin1').send('{"name":"x"}');
    expectError(res, 415);
  });

  it('a malformed %-escape in an API path is 400', async () => {
    expectError(await office.agent.get('/api/customers/%E0%A4%A'), 400, 'bad_uri');
    expectError(await office.agent.get('/api/equipment/%E0%A4%A'), 400, 'bad_uri');
    expectError(await office.agent.post('/api/customers/%E0%A4%A/archive').set(CSRF_HEADER_NAME, office.csrf).send({}), 400, 'bad_uri');
  });

  it('a malformed %-escape on the client fallback is 400, and client routes still load', async () => {
    const dist = mkdtempSync(join(tmpdir(), 'sw-dist-'));
    writeFileSync(join(dist, 'index.html'), '<!doctype html><title>Seasonwell</title>');
    const withClient = testApp({ env: { CLIENT_DIST: dist } });
    try {
      const bad = await request(withClient.app).get('/portal/%E0%A4%A');
      expect(bad.status).toBe(400);
      expect(bad.body).toEqual({ error: expect.objectContaining({ code: 'bad_uri' }) });
      await request(withClient.app)
        .get('/portal/visits')
        .expect(200)
        .expect(/Seasonwell/);
    } finally {
      await withClient.close();
    }
  });

  it('too many multipart fields is 400', async () => {
    let req = dana.agent.post('/api/files').set(CSRF_HEADER_NAME, dana.csrf);
    for (let i = 0; i < 40; i++) req = req.field(`f${i}`, 'x');
    expectError(await req, 400, 'too_many_fields');
  });

  it('a truncated multipart body is 400', async () => {
    const res = await dana.agent
      .post('/api/files')
      .set(CSRF_HEADER_NAME, dana.csrf)
      .set('Content-Type', 'multipart/form-data; boundary=XyZ')
      .send('--XyZ\r\nContent-Disposition: form-data; name="files"; filename="a.jpg"\r\nContent-Type: image/jpeg\r\n\r\nabc');
    expectError(res, 400);
  });

  it('JSON nested without end is 400', async () => {
    const deep = '['.repeat(5000) + ']'.repeat(5000);
    const res = await office.agent.post('/api/customers').set(CSRF_HEADER_NAME, office.csrf).set('Content-Type', 'application/json').send(`{"name":${deep}}`);
    expectError(res, 400);
  });
});

describe('NUL and lone surrogates are refused at the edge, naming the field', () => {
  it('in a search box', async () => {
    const res = await office.agent.get('/api/customers').query({ q: 'Whit\u0000field' });
    expectError(res, 400, 'bad_text');
    expect(res.body.error.fields).toHaveProperty('q');
    const board = await office.agent.get('/api/dispatch/households').query({ q: 'ab\u0000' });
    expectError(board, 400, 'bad_text');
    expect(board.body.error.fields).toHaveProperty('q');
  });

  it('in a path id', async () => {
    const res = await office.agent.get('/api/customers/abc%00def');
    expectError(res, 400, 'bad_text');
    expect(res.body.error.fields).toHaveProperty('id');
    const eq = await office.agent.get('/api/equipment/%00');
    expectError(eq, 400, 'bad_text');
  });

  it('in an e-mail address, and the rate-limit store never sees it', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const before = await countRows('rate_limit_hits');
    const res = await agent.post('/api/auth/link').set(CSRF_HEADER_NAME, csrf).send({ email: 'nul\u0000@example.test' });
    expectError(res, 400, 'bad_text');
    expect(res.body.error.fields).toHaveProperty('email');
    expect(await countRows('rate_limit_hits')).toBe(before);
    const staff = await agent
      .post('/api/auth/staff/sign-in')
      .set(CSRF_HEADER_NAME, csrf)
      .send({ email: `${OWNER}\u0000`, password: 'x' });
    expectError(staff, 400, 'bad_text');
  });

  it('deep in a body, and in a key', async () => {
    const lines = [{ description: 'Labor \u0000', kind: 'labor', quantity: 1, unitCents: 100, taxable: false }];
    const res = await office.agent.post('/api/invoices').set(CSRF_HEADER_NAME, office.csrf).send({ customerId: danaCustomerId, lines });
    expectError(res, 400, 'bad_text');
    expect(res.body.error.fields).toHaveProperty(['lines.0.description']);
    const key = await office.agent.post('/api/customers').set(CSRF_HEADER_NAME, office.csrf).set('Content-Type', 'application/json').send('{"name":"x","a\\u0000":1}');
    expectError(key, 400, 'bad_text');
  });

  it('a lone surrogate in a body or query is 400 naming the field', async () => {
    const before = await countRows('customers');
    const res = await office.agent.post('/api/customers').set(CSRF_HEADER_NAME, office.csrf).set('Content-Type', 'application/json').send('{"name":"Half \\ud83d household"}');
    expectError(res, 400, 'bad_text');
    expect(res.body.error.fields).toHaveProperty('name');
    expect(await countRows('customers')).toBe(before);
    const notes = await dana.agent.post('/api/my-home/notes').set(CSRF_HEADER_NAME, dana.csrf).set('Content-Type', 'application/json').send('{"body":"\\udc00"}');
    expectError(notes, 400, 'bad_text');
  });

  it('in a header value the app keeps', async () => {
    const { storableTextOnly } = await import('../server/http/edge');
    const req = { query: {}, body: undefined, headers: { 'x-forwarded-for': '203.0.113.9\u0000' } } as never;
    let failed: unknown;
    try {
      storableTextOnly(req, {} as never, () => undefined);
    } catch (err) {
      failed = err;
    }
    expect(failed).toMatchObject({ status: 400, code: 'bad_text', fields: { 'x-forwarded-for': expect.any(String) } });
  });

  it('UTF-8 that encodes a surrogate is a 400 in a path and harmless in a query', async () => {
    // ED A0 80 would be U+D800, which UTF-8 may not encode (RFC 3629 §3).
    expectError(await office.agent.get('/api/customers/%ED%A0%80'), 400, 'bad_uri');
    const res = await office.agent.get('/api/customers?q=%ED%A0%80');
    expect(res.status).toBe(200);
  });

  it('in a multipart field', async () => {
    const res = await dana.agent.post('/api/files').set(CSRF_HEADER_NAME, dana.csrf).field('propertyId', danaPropertyId).field('category', 'problem').field('caption', 'a\u0000b');
    expectError(res, 400, 'bad_text');
    expect(res.body.error.fields).toHaveProperty('caption');
  });
});

describe('database errors caused by input', () => {
  it('maps each input SQLSTATE to a 4xx, reading the driver error under Drizzle', async () => {
    const { fromDatabaseError } = await import('../server/http/errors');
    for (const code of ['22P02', '22003', '22008', '22007', '22021', '22P05', '22001']) {
      const e = fromDatabaseError(Object.assign(new Error('Failed query'), { cause: { code } }));
      expect(e?.status, code).toBeGreaterThanOrEqual(400);
      expect(e?.status, code).toBeLessThan(500);
    }
  });

  it('a malformed id in the path is a 404, never reaching SQL', async () => {
    expectError(await office.agent.get('/api/customers/not-a-uuid'), 404, 'not_found');
    expectError(await office.agent.patch('/api/properties/123').set(CSRF_HEADER_NAME, office.csrf).send({ gateCode: '1' }), 404, 'not_found');
    expectError(await dana.agent.get('/api/files/abc'), 404, 'not_found');
  });
});

describe('dates', () => {
  it('an impossible date is 422 naming the field', async () => {
    const [a] = await ctx.database.db.select({ id: t.agreements.id }).from(t.agreements).limit(1);
    const [p] = await ctx.database.db.select({ id: t.plans.id }).from(t.plans).limit(1);
    const res = await office.agent.post(`/api/agreements/${a!.id}/change-tier`).set(CSRF_HEADER_NAME, office.csrf).send({ planId: p!.id, changeDate: '2026-02-30' });
    expectError(res, 422, 'validation_failed');
    expect(res.body.error.fields).toHaveProperty('changeDate');
    const w = await dana.agent.get('/api/booking/windows').query({ propertyId: danaPropertyId, reason: 'noise', from: '2026-02-30' });
    expectError(w, 422, 'validation_failed');
    expect(w.body.error.fields).toHaveProperty('from');
  });

  it('a homeowner cannot book a visit in year 9999', async () => {
    const before = await countRows('visits');
    const res = await dana.agent
      .post('/api/booking/visits')
      .set(CSRF_HEADER_NAME, dana.csrf)
      .send({ propertyId: danaPropertyId, reason: 'noise', windowStart: '9999-12-30T15:00:00.000Z', noEmergency: true });
    expectError(res, 422, 'validation_failed');
    expect(res.body.error.fields).toHaveProperty('windowStart');
    expect(await countRows('visits')).toBe(before);
    const w = await dana.agent.get('/api/booking/windows').query({ propertyId: danaPropertyId, reason: 'noise', from: '9999-12-25' });
    expectError(w, 422, 'validation_failed');
    expect(w.body.error.fields).toHaveProperty('from');
  });

  it('booking opens 12 months ahead and no further', async () => {
    const company = await ctx.database.db.execute(sql`select time_zone from company limit 1`);
    const zone = String(company.rows[0]?.time_zone ?? 'America/Chicago');
    const inside = DateTime.now().setZone(zone).plus({ months: 12 }).minus({ days: 2 }).toISODate()!;
    // The bound is the UTC day plus one day of time-zone slack, so three days past the horizon is
    // outside at every hour of the company's day.
    const outside = DateTime.now().setZone(zone).plus({ months: 12 }).plus({ days: 3 }).toISODate()!;
    await dana.agent.get('/api/booking/windows').query({ propertyId: danaPropertyId, reason: 'noise', from: inside, days: 1 }).expect(200);
    expectError(await dana.agent.get('/api/booking/windows').query({ propertyId: danaPropertyId, reason: 'noise', from: outside, days: 1 }), 422, 'validation_failed');
  });

  it('a report outside its dates names the field in its message', async () => {
    const res = await office.agent.get('/api/reports/revenue').query({ from: '1990-01-01', to: '1990-01-31' });
    expectError(res, 422, 'validation_failed');
    expect(res.body.error.fields.from).toMatch(/^From: /);
    expect(res.body.error.fields.to).toMatch(/^To: /);
    expect(res.body.error.message).toBe('Please check From, To.');
    const far = await dana.agent.get('/api/booking/windows').query({ propertyId: danaPropertyId, reason: 'noise', from: '2099-01-01', days: 1 });
    expect(far.body.error.fields.from).toMatch(/^From: Booking opens at most 12 months ahead/);
  });

  it('the dispatch board and the week schedule cap their range', async () => {
    const res = await office.agent.get('/api/dispatch/board').query({ from: '9999-12-27', days: 7 });
    expectError(res, 422, 'validation_failed');
    expect(res.body.error.fields).toHaveProperty('from');
    expectError(await office.agent.get('/api/dispatch/board').query({ from: '0001-01-01' }), 422, 'validation_failed');
    const week = await office.agent.get('/api/schedule/week').query({ start: '9999-12-27' });
    expectError(week, 422, 'validation_failed');
    expect(week.body.error.fields).toHaveProperty('start');
    // Within the schema's years, but more than two years from today.
    const later = DateTime.now().plus({ years: 3 }).toISODate()!;
    expect((await office.agent.get('/api/dispatch/board').query({ from: later, days: 7 })).body.error.fields).toHaveProperty('from');
    expect((await office.agent.get('/api/schedule/week').query({ start: later })).body.error.fields).toHaveProperty('start');
    const today = DateTime.now().toISODate()!;
    await office.agent.get('/api/dispatch/board').query({ from: today, days: 7 }).expect(200);
  });

  it('time off and assignments far in the future are refused', async () => {
    const [tech] = await ctx.database.db.select({ id: t.technicians.id }).from(t.technicians).limit(1);
    const before = await countRows('technician_time_off');
    const res = await office.agent
      .post('/api/dispatch/time-off')
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ technicianId: tech!.id, startsAt: '9999-12-30T10:00:00Z', endsAt: '9999-12-31T10:00:00Z' });
    expectError(res, 422, 'validation_failed');
    expect(await countRows('technician_time_off')).toBe(before);
  });
});

describe('money has a stated maximum', () => {
  const line = (quantity: number, unitCents: number) => ({ description: 'Big job', kind: 'other', quantity, unitCents, taxable: true });

  it('a line total past the maximum is 422 naming the line', async () => {
    const before = await countRows('invoices');
    const res = await office.agent
      .post('/api/invoices')
      .set(CSRF_HEADER_NAME, office.csrf)
      .send({ customerId: danaCustomerId, lines: [line(100_000, 100_000_000)] });
    expectError(res, 422, 'validation_failed');
    expect(Object.keys(res.body.error.fields).some((k) => k.startsWith('lines.0'))).toBe(true);
    expect(await countRows('invoices')).toBe(before);
  });

  it('an invoice total past the cents column is 422 naming the field, not an overflow', async () => {
    const before = await countRows('invoices');
    const lines = Array.from({ length: 30 }, () => line(1, 99_999_999));
    const res = await office.agent.post('/api/invoices').set(CSRF_HEADER_NAME, office.csrf).send({ customerId: danaCustomerId, lines });
    expectError(res, 422, 'validation_failed');
    expect(res.body.error.fields).toHaveProperty('lines');
    expect(await countRows('invoices')).toBe(before);
  });
});

describe('rate limits write only after validation', () => {
  it('a huge or malformed e-mail is a 422 and never becomes a rate-limit key', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const before = await countRows('rate_limit_hits');
    const huge = `${'a'.repeat(5000)}@example.test`;
    expectError(await agent.post('/api/auth/link').set(CSRF_HEADER_NAME, csrf).send({ email: huge }), 422, 'validation_failed');
    expectError(await agent.post('/api/auth/password/forgot').set(CSRF_HEADER_NAME, csrf).send({ email: 'not an address' }), 422, 'validation_failed');
    expectError(await agent.post('/api/auth/staff/sign-in').set(CSRF_HEADER_NAME, csrf).send({ email: huge, password: 'x' }), 422, 'validation_failed');
    expect(await rateKeys('aaaaaaaaaa')).toBe(0);
    expect(await countRows('rate_limit_hits')).toBe(before);
  });

  it('a valid request is still counted', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const email = `counted-${Date.now()}@example.test`;
    await agent.post('/api/auth/link').set(CSRF_HEADER_NAME, csrf).send({ email }).expect(202);
    expect(await rateKeys(email)).toBe(1);
  });
});
