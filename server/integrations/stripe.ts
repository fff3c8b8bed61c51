import Stripe from 'stripe';

export type { Stripe };

export interface StripeSettings {
  secretKey: string;
  /** Base URL of the local fake (http://127.0.0.1:3102); absent means the real service. */
  apiUrl?: string;
  /** The SDK retries network errors and 5xx with the same idempotency key; 2 by default. */
  maxNetworkRetries?: number;
  timeoutMs?: number;
}

/** The real SDK, pointed at the fake when an API URL is configured; production switches by keys alone. */
export function createStripe(settings: StripeSettings): Stripe {
  if (!settings || typeof settings.secretKey !== 'string' || settings.secretKey.trim() === '') {
    throw new Error('createStripe: secretKey is required');
  }
  const options: Stripe.StripeConfig = {
    maxNetworkRetries: settings.maxNetworkRetries ?? 2,
    timeout: settings.timeoutMs ?? 20_000,
    appInfo: { name: 'Seasonwell' },
  };
  if (settings.apiUrl) {
    let url: URL;
    try {
      url = new URL(settings.apiUrl);
    } catch {
      throw new Error(`createStripe: apiUrl is not a valid URL: ${settings.apiUrl}`);
    }
    const protocol = url.protocol === 'https:' ? 'https' : 'http';
    options.host = url.hostname;
    options.port = url.port ? Number(url.port) : protocol === 'https' ? 443 : 80;
    options.protocol = protocol;
  }
  return new Stripe(settings.secretKey, options);
}

/** Words a homeowner can act on, from a processor error; never the raw internals. */
export function paymentErrorMessage(err: unknown): string {
  if (err instanceof Stripe.errors.StripeCardError) {
    switch (err.decline_code ?? err.code) {
      case 'insufficient_funds':
        return 'The card was declined for insufficient funds. Please use another card.';
      case 'expired_card':
        return 'The card has expired. Please use another card.';
      default:
        return 'The card was declined. Please use another card or call your bank.';
    }
  }
  return 'The payment could not be completed just now. Please try again in a few minutes.';
}
