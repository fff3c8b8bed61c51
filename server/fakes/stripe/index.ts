// A fake of the card processor's API for tests and local runs, spoken in the
// real SDK's wire format so production switches over by keys alone.
//   /v1/...                 the API subset (auth: Bearer sk_test_...)
//   GET|POST /checkout/:id  hosted test payment page
//   POST /_test/reset       clear all state
//   POST /_test/webhooks    { url?, duplicate?, outOfOrder? }
//   POST /_test/faults      { path, status, times, method? }; DELETE clears them
//   GET /_test/webhooks/deliveries  delivery attempts so far
import express, { type NextFunction, type Request, type Response } from 'express';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { createApiRouter, type Fault, type LoggedRequest } from './api';
import { Engine } from './engine';
import { createHostedPageRouter } from './hosted-page';
import { IdempotencyStore } from './idempotency';
import { WebhookSender, type DeliveryAttempt, type DeliveryBehaviour, type WireEvent } from './webhooks';

export { TEST_CARDS, TEST_PAYMENT_METHODS } from './cards';
export { signPayload } from './webhooks';
export type { DeliveryAttempt, Fault, LoggedRequest, WireEvent };

export interface FakeStripeOptions {
  webhookUrl?: string;
  webhookSecret: string;
  /** Base of the hosted page links; defaults to the address the request came in on. */
  publicUrl?: string;
  /**
   * Milliseconds since the epoch; drives `created`, signatures and idempotency expiry.
   * Webhook receivers check signature timestamps (300 s by default), so a clock far
   * from real time suits API-only tests.
   */
  clock?: () => number;
  /** Only these keys are accepted; by default any `sk_test_…` key is. */
  apiKeys?: readonly string[];
  webhookRetryBaseMs?: number;
  webhookMaxAttempts?: number;
  webhookTimeoutMs?: number;
}

export interface FakeStripe {
  app: express.Express;
  /** Clears every object, event, stored idempotent result, fault and queued delivery. */
  reset(): void;
  setWebhookUrl(url: string | undefined): void;
  setWebhookBehaviour(b: Partial<DeliveryBehaviour>): void;
  /** Answer the next `times` requests under `path` with `status`, storing nothing. */
  addFault(f: Fault): void;
  /** Resolves once every webhook delivery (retries included) has finished. */
  webhooksIdle(): Promise<void>;
  /** Every delivery attempt so far, oldest first. */
  deliveries(): readonly DeliveryAttempt[];
  /** API requests received and their statuses, oldest first. */
  requests(): readonly LoggedRequest[];
  /** Events, newest first. */
  events(): readonly WireEvent[];
  engine: Engine;
  stop(): void;
}

export function createFakeStripe(opts: FakeStripeOptions): FakeStripe {
  if (!opts || typeof opts.webhookSecret !== 'string' || opts.webhookSecret === '') {
    throw new Error('createFakeStripe: webhookSecret is required');
  }
  const clock = opts.clock ?? Date.now;
  const publicUrlOverride = opts.publicUrl?.replace(/\/$/, '');
  const webhooks = new WebhookSender({
    url: opts.webhookUrl,
    secret: opts.webhookSecret,
    clock,
    retryBaseMs: opts.webhookRetryBaseMs,
    maxAttempts: opts.webhookMaxAttempts,
    timeoutMs: opts.webhookTimeoutMs,
  });
  const engine = new Engine(clock, (e) => webhooks.enqueue(e));
  const idempotency = new IdempotencyStore(clock);
  const faults: Fault[] = [];
  const log: LoggedRequest[] = [];
  const publicUrl = (req: Request) => publicUrlOverride ?? `${req.protocol}://${req.get('host')}`;

  const addFault = (f: Fault) => {
    if (typeof f.path !== 'string' || !f.path.startsWith('/')) throw new Error('fault path must start with "/"');
    if (!Number.isInteger(f.status) || f.status < 400 || f.status > 599) throw new Error('fault status must be 400–599');
    const times = f.times ?? 1;
    if (!Number.isInteger(times) || times < 1) throw new Error('fault times must be a whole number 1 or more');
    faults.push({ path: f.path, status: f.status, times, ...(f.method ? { method: f.method } : {}) });
  };

  const reset = () => {
    engine.reset();
    idempotency.clear();
    faults.length = 0;
    log.length = 0;
    webhooks.reset();
  };

  const app = express();
  app.disable('x-powered-by');
  // Nested query parameters (`expand[0]=latest_charge`) need the extended parser.
  app.set('query parser', 'extended');

  const test = express.Router();
  test.use(express.json(), express.urlencoded({ extended: true }));
  test.post('/reset', (_req, res) => {
    reset();
    res.json({ ok: true });
  });
  test.post('/webhooks', (req, res) => {
    const b = (req.body ?? {}) as Record<string, unknown>;
    const flag = (v: unknown) => v === true || v === 'true';
    if ('url' in b) webhooks.url = typeof b['url'] === 'string' && b['url'] ? b['url'] : undefined;
    if ('duplicate' in b) webhooks.behaviour.duplicate = flag(b['duplicate']);
    if ('outOfOrder' in b) webhooks.behaviour.outOfOrder = flag(b['outOfOrder']);
    res.json({ url: webhooks.url ?? null, ...webhooks.behaviour });
  });
  test.get('/webhooks/deliveries', (_req, res) => {
    res.json({ data: webhooks.attempts });
  });
  test.post('/faults', (req, res) => {
    const b = (req.body ?? {}) as Record<string, unknown>;
    try {
      addFault({
        path: String(b['path'] ?? ''),
        status: Number(b['status']),
        times: b['times'] === undefined ? 1 : Number(b['times']),
        ...(typeof b['method'] === 'string' ? { method: b['method'] } : {}),
      });
    } catch (e) {
      res.status(400).json({ error: { type: 'invalid_request_error', message: (e as Error).message } });
      return;
    }
    res.json({ faults });
  });
  test.delete('/faults', (_req, res) => {
    faults.length = 0;
    res.json({ faults });
  });
  app.use('/_test', test);

  app.use('/checkout', createHostedPageRouter(engine, publicUrl));
  app.use('/v1', createApiRouter({ engine, idempotency, faults, log, apiKeys: opts.apiKeys, publicUrl }));

  app.use((_req: Request, res: Response) => {
    res.status(404).json({ error: { type: 'invalid_request_error', message: 'Unrecognized request URL.' } });
  });
  // Body-parser failures and anything unexpected, still in the wire shape.
  app.use((err: Error & { status?: number }, _req: Request, res: Response, _next: NextFunction) => {
    const status = err.status && err.status >= 400 && err.status < 500 ? 400 : 500;
    res.status(status).json({
      error: { type: status === 400 ? 'invalid_request_error' : 'api_error', message: status === 400 ? `Invalid request: ${err.message}` : 'Internal error in the test tool.' },
    });
  });

  return {
    app,
    reset,
    setWebhookUrl: (url) => {
      webhooks.url = url || undefined;
    },
    setWebhookBehaviour: (b) => {
      if (b.duplicate !== undefined) webhooks.behaviour.duplicate = b.duplicate;
      if (b.outOfOrder !== undefined) webhooks.behaviour.outOfOrder = b.outOfOrder;
    },
    addFault,
    webhooksIdle: () => webhooks.idle(),
    deliveries: () => webhooks.attempts,
    requests: () => log,
    events: () => engine.events,
    engine,
    stop: () => webhooks.reset(),
  };
}

export interface StartedFakeStripe {
  port: number;
  url: string;
  fake: FakeStripe;
  close(): Promise<void>;
}

/** Starts the fake on `host:port` (port 0 picks a free one). */
export async function startFakeStripe(opts: Omit<FakeStripeOptions, 'publicUrl'> & { port?: number; host?: string; publicUrl?: string }): Promise<StartedFakeStripe> {
  const host = opts.host ?? '127.0.0.1';
  const fake = createFakeStripe(opts);
  const server: Server = await new Promise((resolve, reject) => {
    const s = fake.app.listen(opts.port ?? 0, host, (err?: Error) => (err ? reject(err) : resolve(s)));
    s.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  const url = `http://${host}:${port}`;
  return {
    port,
    url,
    fake,
    close: () =>
      new Promise<void>((resolve, reject) => {
        fake.stop();
        server.closeAllConnections?.();
        server.close((err) => (err ? reject(err) : resolve()));
      }),
  };
}
