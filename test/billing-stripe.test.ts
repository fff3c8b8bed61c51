import { describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { createStripe, paymentErrorMessage } from '../server/integrations/stripe';

// The factory points the real SDK at the fake by URL alone; without a URL it talks to the real service.
describe('createStripe', () => {
  it('takes host, port and protocol from the fake URL', () => {
    const s = createStripe({ secretKey: 'sk_test_factory', apiUrl: 'http://127.0.0.1:3102' }) as unknown as {
      _api: { host: string; port: string | number; protocol: string; maxNetworkRetries: number };
    };
    expect(s._api.host).toBe('127.0.0.1');
    expect(String(s._api.port)).toBe('3102');
    expect(s._api.protocol).toBe('http');
    // The SDK's default of 2 network retries, kept for production (stripe-node README)
    expect(s._api.maxNetworkRetries).toBe(2);
  });

  it('without a URL keeps the SDK defaults for the real service', () => {
    const s = createStripe({ secretKey: 'sk_test_factory' }) as unknown as { _api: { host: string; protocol: string } };
    // api.stripe.com over https (stripe-node defaults)
    expect(s._api.host).toBe('api.stripe.com');
    expect(s._api.protocol).toBe('https');
  });

  it('refuses a missing key or a bad URL, naming it', () => {
    expect(() => createStripe({ secretKey: '' })).toThrow(/secretKey/);
    expect(() => createStripe({ secretKey: 'sk_test_x', apiUrl: 'not a url' })).toThrow(/apiUrl/);
  });
});

describe('paymentErrorMessage', () => {
  const card = (decline: string) =>
    new Stripe.errors.StripeCardError({ type: 'card_error', code: decline === 'expired_card' ? 'expired_card' : 'card_declined', decline_code: decline, message: 'x' });
  it('words the documented decline codes for the homeowner (docs.stripe.com/declines/codes)', () => {
    expect(paymentErrorMessage(card('insufficient_funds'))).toMatch(/insufficient funds/);
    expect(paymentErrorMessage(card('expired_card'))).toMatch(/expired/);
    expect(paymentErrorMessage(card('generic_decline'))).toMatch(/declined/);
    expect(paymentErrorMessage(new Stripe.errors.StripeAPIError({ type: 'api_error', message: 'boom' }))).toMatch(/try again/);
  });
});
