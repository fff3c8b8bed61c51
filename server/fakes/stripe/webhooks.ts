import { createHmac } from 'node:crypto';
import type { WireEvent } from './wire-types';

// Delivery of events to one endpoint, signed the way Stripe signs them:
// `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "t.body">`.
// Failed deliveries are retried with exponential backoff until a 2xx or the
// attempt limit (real Stripe keeps trying for up to 3 days; tests want ms).

export type { WireEvent };

export function signPayload(payload: string, secret: string, timestampSec: number): string {
  const v1 = createHmac('sha256', secret).update(`${timestampSec}.${payload}`, 'utf8').digest('hex');
  return `t=${timestampSec},v1=${v1}`;
}

export interface WebhookOptions {
  url?: string;
  secret: string;
  clock: () => number;
  /** First retry delay; attempt n waits base × 2^(n−1). Default 200 ms. */
  retryBaseMs?: number;
  /** Attempts in all, first one included. Default 6. */
  maxAttempts?: number;
  /** Per-attempt timeout. Default 5 s. */
  timeoutMs?: number;
}

export interface DeliveryAttempt {
  eventId: string;
  type: string;
  attempt: number;
  status: number | null;
  error?: string;
  at: number;
}

export interface DeliveryBehaviour {
  /** Send every event twice. */
  duplicate: boolean;
  /** Deliver each batch of events (those raised by one API call) newest first. */
  outOfOrder: boolean;
}

export class WebhookSender {
  url: string | undefined;
  readonly behaviour: DeliveryBehaviour = { duplicate: false, outOfOrder: false };
  readonly attempts: DeliveryAttempt[] = [];
  retryBaseMs: number;
  maxAttempts: number;
  private readonly timeoutMs: number;
  private pending: WireEvent[] = [];
  private flushScheduled = false;
  private busy = 0;
  private readonly timers = new Set<ReturnType<typeof setTimeout>>();
  private waiters: (() => void)[] = [];
  private generation = 0;
  private chain: Promise<void> = Promise.resolve();

  constructor(private readonly opts: WebhookOptions) {
    this.url = opts.url;
    this.retryBaseMs = opts.retryBaseMs ?? 200;
    this.maxAttempts = opts.maxAttempts ?? 6;
    this.timeoutMs = opts.timeoutMs ?? 5000;
  }

  enqueue(event: WireEvent): void {
    if (!this.url) return;
    this.pending.push(event);
    if (!this.flushScheduled) {
      this.flushScheduled = true;
      this.busy++;
      const gen = this.generation;
      // Events raised in one API call are collected first, so out-of-order
      // delivery can reverse them as a batch.
      const timer = setTimeout(() => {
        this.timers.delete(timer);
        this.flushScheduled = false;
        const batch = this.pending.splice(0);
        if (this.behaviour.outOfOrder) batch.reverse();
        // One batch after another, so without the switch events arrive in order.
        this.chain = this.chain.then(() => this.deliverBatch(batch, gen)).finally(() => this.done(gen));
      }, 0);
      this.timers.add(timer);
    }
  }

  private async deliverBatch(batch: WireEvent[], gen: number): Promise<void> {
    for (const event of batch) {
      const copies = this.behaviour.duplicate ? 2 : 1;
      for (let i = 0; i < copies; i++) {
        if (gen !== this.generation) return;
        await this.attempt(event, 1, gen);
      }
    }
  }

  private async attempt(event: WireEvent, n: number, gen: number): Promise<void> {
    const url = this.url;
    if (!url || gen !== this.generation) return;
    const payload = JSON.stringify(event, null, 2);
    const t = Math.floor(this.opts.clock() / 1000);
    let status: number | null = null;
    let error: string | undefined;
    try {
      const res = await fetch(url, {
        method: 'POST',
        headers: {
          'content-type': 'application/json; charset=utf-8',
          'stripe-signature': signPayload(payload, this.opts.secret, t),
          'user-agent': 'FakeStripe-Webhooks/1.0',
        },
        body: payload,
        signal: AbortSignal.timeout(this.timeoutMs),
      });
      status = res.status;
      await res.arrayBuffer().catch(() => undefined);
    } catch (e) {
      error = e instanceof Error ? e.message : String(e);
    }
    if (gen !== this.generation) return;
    this.attempts.push({ eventId: event.id, type: event.type, attempt: n, status, ...(error ? { error } : {}), at: this.opts.clock() });
    const ok = status !== null && status >= 200 && status < 300;
    if (ok || n >= this.maxAttempts) return;
    this.busy++;
    const timer = setTimeout(
      () => {
        this.timers.delete(timer);
        void this.attempt(event, n + 1, gen).finally(() => this.done(gen));
      },
      this.retryBaseMs * 2 ** (n - 1),
    );
    this.timers.add(timer);
  }

  private done(gen: number): void {
    if (gen !== this.generation) return;
    this.busy--;
    if (this.busy <= 0) {
      this.busy = 0;
      const w = this.waiters.splice(0);
      for (const f of w) f();
    }
  }

  /** Resolves once nothing is queued, in flight or waiting for a retry. */
  idle(): Promise<void> {
    if (this.busy === 0) return Promise.resolve();
    return new Promise((resolve) => this.waiters.push(resolve));
  }

  /** Drops everything queued or scheduled and forgets past attempts. */
  reset(): void {
    this.generation++;
    this.chain = Promise.resolve();
    for (const t of this.timers) clearTimeout(t);
    this.timers.clear();
    this.pending = [];
    this.attempts.length = 0;
    this.behaviour.duplicate = false;
    this.behaviour.outOfOrder = false;
    this.flushScheduled = false;
    // Work of the old generation no longer counts.
    this.busy = 0;
    const w = this.waiters.splice(0);
    for (const f of w) f();
  }
}
