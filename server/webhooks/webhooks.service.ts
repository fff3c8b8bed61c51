import { eq } from 'drizzle-orm';
import type Stripe from 'stripe';
import type { AppDeps } from '../deps';
import { stripeEvents } from '../db/schema';
import { syncCheckoutSession, syncPaymentIntent } from '../billing/checkout';
import { syncRefunds } from '../billing/refunds';

export const STRIPE_EVENT_JOB = 'stripe-event';

/** Stores a verified event once; true when it is new (a redelivery stores nothing). */
export async function storeEvent(deps: Pick<AppDeps, 'database'>, event: Stripe.Event): Promise<boolean> {
  const rows = await deps.database.db
    .insert(stripeEvents)
    .values({ id: event.id, type: event.type, payload: event as unknown as object })
    .onConflictDoNothing()
    .returning({ id: stripeEvents.id });
  return rows.length > 0;
}

/**
 * Works one stored event. The event only says which object changed; its current state is read
 * back from the processor, so events replayed or arriving out of order all end in the same state.
 */
export async function processStoredEvent(deps: Pick<AppDeps, 'database' | 'clock' | 'logger' | 'jobs' | 'stripe'>, eventId: string): Promise<void> {
  const { db } = deps.database;
  const [row] = await db.select().from(stripeEvents).where(eq(stripeEvents.id, eventId));
  if (!row || row.processedAt) return;
  const event = row.payload as Stripe.Event;
  const object = event.data.object as { id: string; object: string; payment_intent?: string | null; metadata?: Record<string, string> };
  try {
    switch (event.type) {
      case 'checkout.session.completed':
      case 'checkout.session.async_payment_succeeded':
        await syncCheckoutSession(deps, object.id);
        break;
      case 'payment_intent.succeeded':
        if (object.metadata?.['invoiceId']) await syncPaymentIntent(deps, object.id);
        break;
      case 'charge.refunded':
        if (object.payment_intent) await syncRefunds(deps, object.payment_intent);
        break;
      default:
        // Other events (declines on the payment page, setup attempts) change nothing here.
        break;
    }
  } catch (err) {
    await db
      .update(stripeEvents)
      .set({ error: (err as Error).message.slice(0, 500) })
      .where(eq(stripeEvents.id, eventId));
    throw err;
  }
  await db.update(stripeEvents).set({ processedAt: deps.clock(), error: null }).where(eq(stripeEvents.id, eventId));
}

/** Hands a stored event to the job queue, which retries it when processing fails. */
export async function dispatchEvent(deps: Pick<AppDeps, 'jobs'>, eventId: string): Promise<void> {
  await deps.jobs.send(STRIPE_EVENT_JOB, { eventId }, { singletonKey: eventId });
}
