import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { createDatabase } from '../server/db/client';
import { testApp } from './support/app';
import { anonymous, CSRF_HEADER_NAME } from './support/auth';

describe('GET /api/health', () => {
  const ctx = testApp();
  afterAll(() => ctx.close());

  it('reports the database as up', async () => {
    const res = await request(ctx.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'ok', database: 'up' });
  });

  it('answers 503 when the database cannot be reached', async () => {
    // Nothing listens on port 1: the pool cannot connect.
    const down = testApp({ database: createDatabase('postgres://postgres@127.0.0.1:1/none', 1) });
    const res = await request(down.app).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body).toMatchObject({ status: 'unavailable', database: 'down' });
    await down.close();
  });
});

describe('API errors', () => {
  const ctx = testApp();
  afterAll(() => ctx.close());

  it('answers unknown /api routes with 404 in the one error shape', async () => {
    const res = await request(ctx.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'not_found', message: expect.stringContaining('/api/no-such-thing') } });
  });

  it('answers malformed JSON with 400, not 500', async () => {
    const { agent, csrf } = await anonymous(ctx);
    const res = await agent.post('/api/health').set(CSRF_HEADER_NAME, csrf).set('content-type', 'application/json').send('{"broken"');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_json');
  });

  it('sends security headers with a strict content security policy', async () => {
    const res = await request(ctx.app).get('/api/health');
    const csp = res.headers['content-security-policy'];
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toMatch(/https:/);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
  });
});
