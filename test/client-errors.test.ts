/**
 * Requests Node's HTTP parser refuses before Express sees them (headers over Node's 16 KiB
 * default, a request line or header that is not HTTP) still answer in the one error shape.
 */
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { answerClientErrors } from '../server/http/client-errors';
import { testApp, type TestContext } from './support/app';
import { rawRequest } from './support/raw-http';

let ctx: TestContext;
let server: Server;
let port = 0;
beforeAll(async () => {
  ctx = testApp();
  server = await new Promise<Server>((resolve) => {
    const s = ctx.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  answerClientErrors(server);
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  server.closeAllConnections();
  await new Promise((r) => server.close(r));
  await ctx.close();
});

const shape = (code: string) => ({ error: { code, message: expect.any(String) } });

describe("Node's own HTTP errors", () => {
  it("headers past 16 KiB (Node's default maxHeaderSize) are 431 in the one error shape", async () => {
    const res = await rawRequest(port, `GET /api/health HTTP/1.1\r\nHost: localhost\r\nCookie: a=${'x'.repeat(20_000)}\r\n\r\n`);
    expect(res.status).toBe(431);
    expect(res.headers['content-type']).toMatch(/^application\/json/);
    expect(res.body).toEqual(shape('headers_too_large'));
  });

  it('a request line that is not HTTP is 400', async () => {
    const res = await rawRequest(port, 'HELLO THERE\r\n\r\n');
    expect(res.status).toBe(400);
    expect(res.body).toEqual(shape('bad_request'));
  });

  it('a header name with a space, and a bad Content-Length, are 400', async () => {
    for (const bad of [
      'GET /api/health HTTP/1.1\r\nHost: localhost\r\nBad Name: x\r\n\r\n',
      'POST /api/auth/sign-out HTTP/1.1\r\nHost: localhost\r\nContent-Length: ten\r\n\r\n',
    ]) {
      const res = await rawRequest(port, bad);
      expect(res.status, bad).toBe(400);
      expect(res.body).toEqual(shape('bad_request'));
    }
  });

  it('the server goes on answering afterwards', async () => {
    const res = await rawRequest(port, 'GET /api/health HTTP/1.1\r\nHost: localhost\r\nConnection: close\r\n\r\n');
    expect(res.status).toBe(200);
  });
});
