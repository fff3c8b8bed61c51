import type { Mailer } from './integrations/mail';
import type { Jobs } from './jobs/queue';
import type { Stripe } from './integrations/stripe';
import type { Storage } from './integrations/storage';

/**
 * Services the app talks to, passed in by main.ts (real ones) or by tests (fakes on loopback).
 * Each is optional so a test builds only what it uses. Add one line per service.
 */
export interface Services {
  mailer?: Mailer;
  jobs?: Jobs;
  stripe?: Stripe;
  storage?: Storage;
}
