import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { productionEnv, testApp } from './support/app';

// The security headers every answer carries: pages, API answers and errors alike.

const dist = mkdtempSync(join(tmpdir(), 'sw-headers-'));
writeFileSync(join(dist, 'index.html'), '<!doctype html><title>Seasonwell</title>');

const dev = testApp({ env: { CLIENT_DIST: dist } });
const prod = testApp({
  env: { ...productionEnv(), CLIENT_DIST: dist, PUBLIC_URL: 'https://comfort.example' },
});
afterAll(async () => {
  await dev.close();
  await prod.close();
});

/** The CSP as { directive: [values] }. */
function csp(res: request.Response): Record<string, string[]> {
  const header = String(res.headers['content-security-policy'] ?? '');
  return Object.fromEntries(
    header
      .split(';')
      .map((d) => d.trim().split(/\s+/))
      .filter((p) => p[0])
      .map(([name, ...values]) => [name!, values]),
  );
}

const answers = (ctx: typeof dev) =>
  [
    ['a page', () => request(ctx.app).get('/portal')],
    ['an API answer', () => request(ctx.app).get('/api/health')],
    ['an API error', () => request(ctx.app).get('/api/no-such-thing')],
  ] as const;

describe.each([
  ['development', dev],
  ['production', prod],
])('security headers in %s', (mode, ctx) => {
  it.each(answers(ctx))('a Content-Security-Policy that allows only our own origin on %s', async (_what, get) => {
    const policy = csp(await get());
    // CSP Level 3 (W3C): no scripts, frames or plugins from anywhere else.
    expect(policy['default-src']).toEqual(["'self'"]);
    expect(policy['script-src']).toEqual(["'self'"]);
    expect(policy['object-src']).toEqual(["'none'"]);
    expect(policy['base-uri']).toEqual(["'self'"]);
    expect(policy['form-action']).toEqual(["'self'"]);
    expect(policy['connect-src']).toEqual(["'self'"]);
    expect(policy['upgrade-insecure-requests'] !== undefined).toBe(mode === 'production');
  });

  it.each(answers(ctx))('no framing by any site on %s: frame-ancestors none, and X-Frame-Options DENY for older browsers', async (_what, get) => {
    const res = await get();
    expect(csp(res)['frame-ancestors']).toEqual(["'none'"]);
    // RFC 7034: DENY is the X-Frame-Options value that matches frame-ancestors 'none'.
    expect(res.headers['x-frame-options']).toBe('DENY');
  });

  it.each(answers(ctx))('X-Content-Type-Options nosniff on %s', async (_what, get) => {
    // WHATWG Fetch: "nosniff" stops browsers from guessing a script out of another type.
    expect((await get()).headers['x-content-type-options']).toBe('nosniff');
  });

  it.each(answers(ctx))('Referrer-Policy no-referrer on %s', async (_what, get) => {
    // W3C Referrer Policy: links out of the product never carry its addresses (tokens, ids).
    expect((await get()).headers['referrer-policy']).toBe('no-referrer');
  });

  it('no X-Powered-By', async () => {
    expect((await request(ctx.app).get('/api/health')).headers['x-powered-by']).toBeUndefined();
  });
});

describe('HSTS', () => {
  it('is sent in production for a year, subdomains included', async () => {
    const res = await request(prod.app).get('/api/health');
    // RFC 6797 §6.1; a year is the common practice (and the HSTS preload list's minimum).
    const hsts = String(res.headers['strict-transport-security']);
    expect(hsts).toMatch(/max-age=(\d+)/);
    expect(Number(/max-age=(\d+)/.exec(hsts)![1])).toBeGreaterThanOrEqual(31_536_000);
    expect(hsts).toMatch(/includeSubDomains/);
  });

  it('is not sent in development, where the app runs over plain http', async () => {
    expect((await request(dev.app).get('/api/health')).headers['strict-transport-security']).toBeUndefined();
  });
});
