import express, { Router } from 'express';
import Stripe from 'stripe';
import type { AppDeps } from '../deps';
import { AppError } from '../http/errors';
import { dispatchEvent, storeEvent } from './webhooks.service';

/** Mounted before the JSON parser: the signature covers the exact bytes sent. */
export function webhookRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.post('/stripe', express.raw({ type: () => true, limit: '1mb' }), async (req, res) => {
    const signature = req.get('stripe-signature');
    const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    if (!signature) throw new AppError(400, 'bad_signature', 'The Stripe-Signature header is missing.');
    let event: Stripe.Event;
    try {
      event = Stripe.webhooks.constructEvent(body, signature, deps.config.STRIPE_WEBHOOK_SECRET);
    } catch {
      throw new AppError(400, 'bad_signature', 'The webhook signature does not match.');
    }
    if (await storeEvent(deps, event)) await dispatchEvent(deps, event.id);
    res.json({ received: true });
  });
  return router;
}
