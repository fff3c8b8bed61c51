import type { CardFailure } from './cards';

// Errors in the wire shape the Stripe SDK reads: `{ error: { type, code, decline_code, message, param } }`.
// The HTTP status is what picks the SDK's error class.

export interface WireError {
  type: string;
  message: string;
  code?: string;
  decline_code?: string;
  param?: string;
  doc_url?: string;
  charge?: string;
  payment_intent?: unknown;
  setup_intent?: unknown;
  payment_method?: unknown;
}

export class FakeStripeError extends Error {
  constructor(
    readonly status: number,
    readonly body: WireError,
  ) {
    super(body.message);
    this.name = 'FakeStripeError';
  }
}

/** Error type to send with a status when none is given (used by the fault switch). */
export function errorTypeForStatus(status: number): string {
  if (status === 400 || status === 404 || status === 403 || status === 429) return 'invalid_request_error';
  if (status === 401) return 'authentication_error';
  if (status === 402) return 'card_error';
  return 'api_error';
}

export function invalidRequest(message: string, param?: string, code?: string, status = 400): FakeStripeError {
  return new FakeStripeError(status, { type: 'invalid_request_error', message, ...(param ? { param } : {}), ...(code ? { code } : {}) });
}

export const missingParam = (param: string) => invalidRequest(`Missing required param: ${param}.`, param, 'parameter_missing');

export const unknownParam = (param: string) => invalidRequest(`Received unknown parameter: ${param}`, param, 'parameter_unknown');

export const invalidParam = (param: string, message: string, code = 'parameter_invalid') => invalidRequest(message, param, code);

export const noSuch = (kind: string, id: string, param = 'id') => invalidRequest(`No such ${kind}: '${id}'`, param, 'resource_missing', 404);

export const unexpectedState = (kind: 'payment_intent' | 'setup_intent' | 'checkout_session', message: string) => invalidRequest(message, undefined, `${kind}_unexpected_state`);

/** A refused card, with the objects the SDK attaches to the error (`payment_intent`, `setup_intent`, ...). */
export function cardError(f: CardFailure, param?: string, extra: Partial<WireError> = {}): FakeStripeError {
  return new FakeStripeError(402, {
    type: 'card_error',
    code: f.code,
    ...(f.decline_code ? { decline_code: f.decline_code } : {}),
    message: f.message,
    ...(param ? { param } : {}),
    ...extra,
  });
}
